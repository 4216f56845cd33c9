export { TrendsScreen as default } from '@/components/review/trends-screen';
