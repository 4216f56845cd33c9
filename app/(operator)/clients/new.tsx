export { NewClientScreen as default } from '@/features/clients/new-client-screen';
