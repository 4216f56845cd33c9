export { PractitionerHomeScreen as default } from '@/features/home/practitioner-home-screen';
