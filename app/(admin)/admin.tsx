export { AdminHomeScreen as default } from '@/components/admin/admin-home-screen';
