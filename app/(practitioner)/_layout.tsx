export { PractitionerLayout as default } from '@/components/practitioner/practitioner-layout';
