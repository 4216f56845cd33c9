import { RoleGuard } from '@/components/auth/role-guard';
import { RoleTabs, type TabSpec } from '@/components/nav/role-tabs';
import { OutboxCountBadge } from '@/components/outbox/outbox-count-badge';
import { AccountIcon, ClientsIcon, OutboxIcon } from '@/components/ui/icons';
import { useClinicConsentText } from '@/hooks/consent/clinic-consent-text';
import { useClinicKeyPrefetch } from '@/hooks/local-store/queries';
import { DeviceSyncProvider } from '@/hooks/sync';

const tabs: readonly TabSpec[] = [
  { name: 'clients', title: 'Clients', Icon: ClientsIcon },
  { name: 'outbox', title: 'Outbox', Icon: OutboxIcon, Badge: OutboxCountBadge },
  { name: 'account', title: 'Account', Icon: AccountIcon },
];

/** Fetched while the operator is online after signing in, so capture offline has both. */
function PrefetchForOfflineCapture() {
  useClinicKeyPrefetch();
  useClinicConsentText();
  return null;
}

export function OperatorLayout() {
  return (
    <RoleGuard role="operator">
      <DeviceSyncProvider>
        <PrefetchForOfflineCapture />
        <RoleTabs tabs={tabs} />
      </DeviceSyncProvider>
    </RoleGuard>
  );
}
