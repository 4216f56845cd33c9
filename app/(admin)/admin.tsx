export { AdminHomeScreen as default } from '@/features/home/admin-home-screen';
