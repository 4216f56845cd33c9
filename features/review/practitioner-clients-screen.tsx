import { ClippedText } from '@/ui/clipped-text';
import { Cell, type Column } from '@/ui/data-table';
import { formatDate } from '@/ui/format';
import { colors } from '@/ui/theme';
import { ClientDirectory } from '@/features/client-records/client-directory';
import type { ClientRow } from '@/shared/protocol/practice';

export const clientName = (c: { firstName: string; lastName: string }) => `${c.firstName} ${c.lastName}`;

const columns: readonly Column<ClientRow>[] = [
  {
    key: 'name',
    title: 'Client',
    flex: 2,
    sortKey: 'name',
    render: (c) => (
      <ClippedText
        text={clientName(c)}
        lines={2}
        variant="smallStrong"
        color={colors.ink}
        testID={`clients-name-${c.id}`}
      />
    ),
  },
  {
    key: 'dob',
    title: 'Born',
    sortKey: 'dateOfBirth',
    render: (c) => <Cell>{formatDate(c.dateOfBirth)}</Cell>,
  },
  { key: 'visits', title: 'Visits', flex: 0.6, render: (c) => <Cell figures>{c.visits}</Cell> },
  {
    key: 'last',
    title: 'Last visit',
    sortKey: 'lastVisit',
    render: (c) => <Cell>{formatDate(c.lastVisit)}</Cell>,
  },
  {
    key: 'next',
    title: 'Next follow-up',
    render: (c) => <Cell muted={!c.nextFollowUp}>{formatDate(c.nextFollowUp)}</Cell>,
  },
];

/** The practitioner's clients: find one by name, e-mail or phone, then open their visits and trends. */
export function PractitionerClientsScreen() {
  return (
    <ClientDirectory
      title="Clients"
      subtitle="Find a client to see their visits and how their measurements change over time."
      screenTestID="practitioner-clients"
      testID="clients"
      tableTestID="clients-table"
      rowTestID={(c) => `clients-row-${c.id}`}
      columns={columns}
      sortChoices={[
        { value: 'name', label: 'Name' },
        { value: 'lastVisit', label: 'Last visit' },
      ]}
      open={(c) => ({ pathname: '/review-clients/[clientId]', params: { clientId: c.id } })}
    />
  );
}
