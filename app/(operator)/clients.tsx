export { OperatorHomeScreen as default } from '@/features/home/operator-home-screen';
