import { lazyLayout } from '@/features/root/lazy-layout';

export default lazyLayout(() => import('@/features/nav/operator-layout').then((m) => m.OperatorLayout));
