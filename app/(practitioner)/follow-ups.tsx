export { FollowUpsScreen as default } from '@/features/review/follow-ups-screen';
