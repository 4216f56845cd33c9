export { TrendsScreen as default } from '@/features/review/trends-screen';
