export { ClientDetailScreen as default } from '@/components/operator/client-detail-screen';
