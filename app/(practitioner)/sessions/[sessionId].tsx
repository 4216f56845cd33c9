export { SessionViewScreen as default } from '@/features/review/session-view-screen';
