import { RoleGuard } from '@/features/auth/role-guard';
import { RoleTabs, type TabSpec } from './role-tabs';
import { FollowUpsIcon } from '@/features/review/follow-ups-icon';
import { ClientsIcon, SessionsIcon } from '@/ui/icons';

export const practitionerTabs: readonly TabSpec[] = [
  { name: 'sessions', title: 'Sessions', Icon: SessionsIcon },
  { name: 'review-clients/index', title: 'Clients', Icon: ClientsIcon },
  { name: 'follow-ups', title: 'Follow-ups', Icon: FollowUpsIcon },
];

export function PractitionerLayout() {
  return (
    <RoleGuard role="practitioner">
      <RoleTabs tabs={practitionerTabs} />
    </RoleGuard>
  );
}
