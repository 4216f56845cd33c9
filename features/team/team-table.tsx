import { roleLabels } from '@/features/nav/role-labels';
import { Badge } from '@/ui/badge';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import type { TeamMember } from '@/shared/protocol';

const columns: readonly Column<TeamMember>[] = [
  { key: 'name', title: 'Name', render: (m) => <Cell strong>{m.name}</Cell> },
  { key: 'email', title: 'E-mail', flex: 2, render: (m) => <Cell muted>{m.email}</Cell> },
  { key: 'role', title: 'Role', render: (m) => <Badge label={roleLabels[m.role]} tone="ink" /> },
  {
    key: 'status',
    title: 'Status',
    render: (m) => <Badge label={m.disabled ? 'Disabled' : 'Active'} tone={m.disabled ? 'danger' : 'good'} />,
  },
];

export function TeamTable({ members, wide }: { members: readonly TeamMember[]; wide: boolean }) {
  return (
    <DataTable
      rows={members}
      columns={columns}
      rowKey={(m) => m.id}
      wide={wide}
      testID="team-list"
      rowTestID={(m) => `team-row-${m.id}`}
    />
  );
}
