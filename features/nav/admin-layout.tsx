import { RoleGuard } from '@/features/auth/role-guard';
import { RoleTabs, type TabSpec } from './role-tabs';
import {
  AuditIcon,
  BillingIcon,
  MailIcon,
  OverviewIcon,
  RecordsIcon,
  SettingsIcon,
  TeamIcon,
} from '@/ui/icons';
import { ConflictsIcon } from '@/features/conflicts/conflicts-icon';

export const adminTabs: readonly TabSpec[] = [
  { name: 'admin', title: 'Overview', Icon: OverviewIcon },
  { name: 'team', title: 'Team', Icon: TeamIcon },
  { name: 'client-records/index', title: 'Clients', Icon: RecordsIcon },
  { name: 'billing', title: 'Billing', Icon: BillingIcon },
  { name: 'audit', title: 'Audit', Icon: AuditIcon },
  { name: 'settings', title: 'Settings', Icon: SettingsIcon },
  { name: 'conflicts/index', title: 'Conflicts', Icon: ConflictsIcon },
  { name: 'mailbox', title: 'Mailbox', Icon: MailIcon },
];

export function AdminLayout() {
  return (
    <RoleGuard role="admin">
      <RoleTabs tabs={adminTabs} />
    </RoleGuard>
  );
}
