export { AppRoot as default } from '@/features/root/app-root';
