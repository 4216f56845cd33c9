export { BillingScreen as default } from '@/components/admin/billing/billing-screen';
