export { AdminLayout as default } from '@/features/nav/admin-layout';
