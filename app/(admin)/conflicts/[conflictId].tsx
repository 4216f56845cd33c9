export { ConflictDetailScreen as default } from '@/components/admin/conflicts/conflict-detail-screen';
