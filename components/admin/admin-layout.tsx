import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { OverviewIcon } from '@/components/ui/icons';

const tabs: readonly TabSpec[] = [{ name: 'admin', title: 'Overview', Icon: OverviewIcon }];

export function AdminLayout() {
  return (
    <RoleGuard role="admin">
      <RoleTabs tabs={tabs} />
    </RoleGuard>
  );
}
