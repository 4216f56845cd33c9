export { TeamScreen as default } from '@/components/admin/team/team-screen';
