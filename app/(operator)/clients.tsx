export { OperatorHomeScreen as default } from '@/components/operator/operator-home-screen';
