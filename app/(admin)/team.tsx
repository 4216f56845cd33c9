export { TeamScreen as default } from '@/features/team/team-screen';
