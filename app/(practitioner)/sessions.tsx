export { PractitionerHomeScreen as default } from '@/components/practitioner/practitioner-home-screen';
