export { ConflictDetailScreen as default } from '@/features/conflicts/conflict-detail-screen';
