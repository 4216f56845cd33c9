import { RoleGuard } from '@/features/auth/role-guard';
import { RoleTabs, type TabSpec } from './role-tabs';
import { SessionsIcon } from '@/ui/icons';

const tabs: readonly TabSpec[] = [{ name: 'sessions', title: 'Sessions', Icon: SessionsIcon }];

export function PractitionerLayout() {
  return (
    <RoleGuard role="practitioner">
      <RoleTabs tabs={tabs} />
    </RoleGuard>
  );
}
