export { OperatorAccountScreen as default } from '@/components/operator/operator-account-screen';
