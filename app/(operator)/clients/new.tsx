export { NewClientScreen as default } from '@/components/operator/new-client-screen';
