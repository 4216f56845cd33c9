export { AppRoot as default } from '@/components/root/app-root';
