export { OperatorAccountScreen as default } from '@/features/auth/operator-account-screen';
