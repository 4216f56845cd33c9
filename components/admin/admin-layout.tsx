import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { OverviewIcon } from '@/components/ui/icons';
import { ConflictsIcon } from './conflicts/conflicts-icon';

const tabs: readonly TabSpec[] = [
  { name: 'admin', title: 'Overview', Icon: OverviewIcon },
  { name: 'conflicts/index', title: 'Conflicts', Icon: ConflictsIcon },
];

export function AdminLayout() {
  return (
    <RoleGuard role="admin">
      <RoleTabs tabs={tabs} />
    </RoleGuard>
  );
}
