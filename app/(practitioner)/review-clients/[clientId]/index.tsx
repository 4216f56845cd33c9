export { PractitionerClientScreen as default } from '@/features/review/practitioner-client-screen';
