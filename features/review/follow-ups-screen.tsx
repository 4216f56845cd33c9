import { useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Badge } from '@/ui/badge';
import { ChoiceChips } from '@/ui/choice-chips';
import { ClippedText } from '@/ui/clipped-text';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { QueryView } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { useFollowUpsDueQuery } from '@/features/home/api';
import type { FollowUpDue } from '@/shared/protocol/practice';
import { dueWords, reminderWords } from './follow-up-words';

const windows = [
  { value: '14', label: 'Next 2 weeks' },
  { value: '30', label: 'Next 30 days' },
  { value: '90', label: 'Next 3 months' },
] as const;
type Window = (typeof windows)[number]['value'];

const columns: readonly Column<FollowUpDue>[] = [
  {
    key: 'client',
    title: 'Client',
    flex: 2,
    render: (d) => (
      <ClippedText
        text={d.clientName}
        lines={2}
        variant="smallStrong"
        color={colors.ink}
        testID={`follow-ups-name-${d.clientId}`}
      />
    ),
  },
  { key: 'date', title: 'Follow-up', render: (d) => <Cell>{formatDate(d.followUpDate)}</Cell> },
  {
    key: 'due',
    title: 'Due',
    render: (d) => <Badge {...dueWords(d.daysUntil)} testID={`follow-ups-due-${d.clientId}`} />,
  },
  { key: 'last', title: 'Last visit', render: (d) => <Cell>{formatDate(d.lastVisit)}</Cell> },
  {
    key: 'reminder',
    title: 'Reminder',
    flex: 1.2,
    render: (d) => <Badge {...reminderWords[d.reminderStatus]} />,
  },
];

/** Clients whose follow-up date has passed or falls soon, overdue first; open one to see their visits. */
export function FollowUpsScreen() {
  const router = useRouter();
  const { isWide } = useLayout();
  const [within, setWithin] = useState<Window>('14');
  const due = useFollowUpsDueQuery(Number(within));

  const body = (
    <QueryView
      query={due}
      loading="Loading follow-ups…"
      testID="follow-ups"
      empty={{
        title: 'Nobody due',
        detail: "No follow-up has passed or falls in this period. Follow-up dates are set in a visit's plan.",
      }}
    >
      {(rows) => (
        <DataTable
          rows={[...rows].sort((a, b) => a.daysUntil - b.daysUntil)}
          columns={columns}
          rowKey={(d) => d.clientId}
          rowTestID={(d) => `follow-ups-row-${d.clientId}`}
          wide={isWide}
          testID="follow-ups-table"
          onRowPress={(d) =>
            router.push({
              pathname: '/review-clients/[clientId]',
              params: { clientId: d.clientId, from: 'follow-ups' },
            })
          }
        />
      )}
    </QueryView>
  );

  return (
    <ScreenFrame
      title="Follow-ups due"
      subtitle="Clients whose follow-up has passed or is coming up, overdue first."
      testID="follow-ups-screen"
      header={
        <View style={styles.tools}>
          <ChoiceChips
            label="Show follow-ups in"
            testID="follow-ups-window"
            value={within}
            onChange={setWithin}
            choices={windows}
          />
        </View>
      }
    >
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  tools: { marginTop: space.sm },
});
