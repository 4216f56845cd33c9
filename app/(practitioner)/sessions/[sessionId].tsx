export { SessionViewScreen as default } from '@/components/review/session-view-screen';
