export { ConflictsScreen as default } from '@/features/conflicts/conflicts-screen';
