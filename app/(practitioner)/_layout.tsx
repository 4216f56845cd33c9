export { PractitionerLayout as default } from '@/features/nav/practitioner-layout';
