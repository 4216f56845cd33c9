import { RoleGuard } from '@/features/auth/role-guard';
import { RoleTabs, type TabSpec } from './role-tabs';
import { OutboxCountBadge } from '@/features/outbox/outbox-count-badge';
import { AccountIcon, ClientsIcon, OutboxIcon } from '@/ui/icons';
import { useClinicConsentText } from '@/device/consent/clinic-consent-text';
import { useClinicKeyPrefetch } from '@/device/local-store/queries';
import { DeviceSyncProvider } from '@/device/sync';

export const operatorTabs: readonly TabSpec[] = [
  // A capture is started from a client's page, so it is part of the Clients section.
  { name: 'clients', title: 'Clients', Icon: ClientsIcon, owns: ['capture'] },
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
        <RoleTabs tabs={operatorTabs} />
      </DeviceSyncProvider>
    </RoleGuard>
  );
}
