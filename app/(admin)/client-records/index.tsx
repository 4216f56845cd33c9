export { ClientTableScreen as default } from '@/components/admin/clients/client-table-screen';
