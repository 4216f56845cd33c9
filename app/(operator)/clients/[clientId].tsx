export { ClientDetailScreen as default } from '@/features/clients/client-detail-screen';
