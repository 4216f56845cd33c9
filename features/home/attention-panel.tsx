import { router, type Href } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { Panel } from '@/ui/panel';
import { colors, radii, space } from '@/ui/theme';
import { useAttentionQuery } from './api';

type Item = {
  key: string;
  count: number;
  label: string;
  detail: string;
  action?: { label: string; href: Href };
};

/** What needs the admin now; each line says where to deal with it. Nothing to do reads as such. */
export function AttentionPanel() {
  const attention = useAttentionQuery();
  if (attention.isPending || attention.isError) return null;
  const { openConflicts, undeliveredReports, clientsPastRetention, failingBackgroundTasks } = attention.data;
  const items: Item[] = [
    {
      key: 'conflicts',
      count: openConflicts,
      label: openConflicts === 1 ? 'conflict to settle' : 'conflicts to settle',
      detail: 'Two phones changed the same record while offline; nothing was overwritten until you choose.',
      action: { label: 'Open conflicts', href: '/conflicts' },
    },
    {
      key: 'reports',
      count: undeliveredReports,
      label: undeliveredReports === 1 ? 'report e-mail not delivered' : 'report e-mails not delivered',
      detail:
        'The mail server refused them or the retries ran out. A practitioner checks the address and sends again from the session.',
    },
    {
      key: 'retention',
      count: clientsPastRetention,
      label: clientsPastRetention === 1 ? 'client past retention' : 'clients past retention',
      detail: 'Their records are older than the clinic keeps them: export, erase, or keep with a reason.',
      action: { label: 'Review them', href: '/client-records?retention=due' },
    },
    {
      key: 'background',
      count: failingBackgroundTasks,
      label:
        failingBackgroundTasks === 1 ? 'automatic task is not working' : 'automatic tasks are not working',
      detail:
        'Follow-up reminders, report e-mail retries or the removal of erased records keep failing. The server keeps trying; tell whoever runs your server.',
    },
  ].filter((i) => i.count > 0);

  return (
    <Panel title="Needs you" testID="attention">
      {items.length === 0 ? (
        <AppText variant="small" color={colors.textMuted} testID="attention-none">
          Nothing waiting: no open conflicts, every report delivered or on its way, no records past retention.
        </AppText>
      ) : (
        items.map((i) => (
          <View key={i.key} style={styles.item} testID={`attention-${i.key}`}>
            <AppText variant="numberLarge" color={colors.ink}>
              {i.count}
            </AppText>
            <View style={styles.text}>
              <AppText variant="bodyStrong" color={colors.ink}>
                {i.label}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                {i.detail}
              </AppText>
            </View>
            {i.action ? (
              <Button
                label={i.action.label}
                variant="secondary"
                onPress={() => router.push(i.action!.href)}
                testID={`attention-${i.key}-open`}
              />
            ) : null}
          </View>
        ))
      )}
    </Panel>
  );
}

const styles = StyleSheet.create({
  item: {
    flexDirection: 'row',
    alignItems: 'center',
    flexWrap: 'wrap',
    gap: space.md,
    padding: space.md,
    borderRadius: radii.md,
    backgroundColor: colors.surfaceMuted,
  },
  text: { flex: 1, minWidth: 200, gap: space.xs },
});
