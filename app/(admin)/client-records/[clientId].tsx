export { ClientRecordScreen as default } from '@/features/client-records/client-record-screen';
