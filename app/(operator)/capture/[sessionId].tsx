export { CaptureScreen as default } from '@/components/capture/capture-screen';
