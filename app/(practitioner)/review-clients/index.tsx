export { PractitionerClientsScreen as default } from '@/features/review/practitioner-clients-screen';
