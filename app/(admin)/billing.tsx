export { BillingScreen as default } from '@/features/billing/billing-screen';
