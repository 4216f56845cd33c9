export { StartRedirect as default } from '@/components/auth/start-redirect';
