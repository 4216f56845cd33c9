import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { SessionsIcon } from '@/components/ui/icons';

const tabs: readonly TabSpec[] = [{ name: 'sessions', title: 'Sessions', Icon: SessionsIcon }];

export function PractitionerLayout() {
  return (
    <RoleGuard role="practitioner">
      <RoleTabs tabs={tabs} />
    </RoleGuard>
  );
}
