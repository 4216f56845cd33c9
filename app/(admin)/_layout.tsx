import { lazyLayout } from '@/features/root/lazy-layout';

export default lazyLayout(() => import('@/features/nav/admin-layout').then((m) => m.AdminLayout));
