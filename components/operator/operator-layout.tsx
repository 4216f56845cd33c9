import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { AccountIcon, ClientsIcon } from '@/components/ui/icons';

const tabs: readonly TabSpec[] = [
  { name: 'clients', title: 'Clients', Icon: ClientsIcon },
  { name: 'account', title: 'Account', Icon: AccountIcon },
];

export function OperatorLayout() {
  return (
    <RoleGuard role="operator">
      <RoleTabs tabs={tabs} />
    </RoleGuard>
  );
}
