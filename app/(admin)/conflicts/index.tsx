export { ConflictsScreen as default } from '@/components/admin/conflicts/conflicts-screen';
