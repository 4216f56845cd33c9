export { ClientRecordScreen as default } from '@/components/admin/clients/client-record-screen';
