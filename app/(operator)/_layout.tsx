export { OperatorLayout as default } from '@/features/nav/operator-layout';
