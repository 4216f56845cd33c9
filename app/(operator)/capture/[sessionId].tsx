export { CaptureScreen as default } from '@/features/capture/capture-screen';
