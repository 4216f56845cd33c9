import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { OutboxCountBadge } from '@/components/outbox/outbox-count-badge';
import { AccountIcon, ClientsIcon, OutboxIcon } from '@/components/ui/icons';
import { DeviceSyncProvider } from '@/hooks/sync';

const tabs: readonly TabSpec[] = [
  { name: 'clients', title: 'Clients', Icon: ClientsIcon },
  { name: 'outbox', title: 'Outbox', Icon: OutboxIcon, Badge: OutboxCountBadge },
  { name: 'account', title: 'Account', Icon: AccountIcon },
];

export function OperatorLayout() {
  return (
    <RoleGuard role="operator">
      <DeviceSyncProvider>
        <RoleTabs tabs={tabs} />
      </DeviceSyncProvider>
    </RoleGuard>
  );
}
