export { AdminLayout as default } from '@/components/admin/admin-layout';
