import { lazyLayout } from '@/features/root/lazy-layout';

export default lazyLayout(() =>
  import('@/features/nav/practitioner-layout').then((m) => m.PractitionerLayout),
);
