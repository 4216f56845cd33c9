export { ClientTableScreen as default } from '@/features/client-records/client-table-screen';
