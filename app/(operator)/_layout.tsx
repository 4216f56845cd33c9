export { OperatorLayout as default } from '@/components/operator/operator-layout';
