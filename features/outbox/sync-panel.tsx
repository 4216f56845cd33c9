import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { formatTime } from '@/ui/format';
import { colors, radii, space } from '@/ui/theme';
import { useOutboxCount } from '@/device/local-store/queries';
import { useDeviceSync } from '@/device/sync/sync-context';

function lastRunWords(at: number | undefined): string {
  if (!at) return 'Not synced yet on this visit.';
  return `Last tried at ${formatTime(new Date(at).toISOString())}.`;
}

/** Whether the device is sending, why it is not, and a manual "Sync now". */
export function SyncPanel() {
  const sync = useDeviceSync();
  const pending = useOutboxCount().data ?? 0;
  if (!sync.ready) return null;
  let line: string;
  if (sync.outdated) line = '';
  else if (!sync.online) line = 'Offline. Everything stays here, sealed, and goes when the network returns.';
  else if (sync.running) line = 'Sending to the clinic…';
  else if (sync.lastError) line = `Not sent yet: ${sync.lastError} Retrying on its own.`;
  else if (pending > 0)
    line = `${pending} item${pending === 1 ? '' : 's'} not sent yet; each one below says why.`;
  else line = 'Up to date with the clinic.';
  return (
    <View style={styles.panel} testID="sync-panel">
      {sync.outdated ? (
        <View style={styles.outdated} testID="sync-outdated" accessibilityRole="alert">
          <AppText variant="smallStrong" color={colors.danger}>
            This app is out of date
          </AppText>
          <AppText variant="small" color={colors.danger}>
            {sync.outdated}
          </AppText>
        </View>
      ) : null}
      <View style={styles.row}>
        <View style={styles.words}>
          {line ? (
            <AppText variant="small" color={colors.text} testID="sync-status">
              {line}
            </AppText>
          ) : null}
          <AppText variant="caption" color={colors.textMuted} testID="sync-last-run">
            {lastRunWords(sync.lastRunAt)}
          </AppText>
        </View>
        <Button
          label="Sync now"
          variant="secondary"
          testID="sync-now"
          busy={sync.running}
          onPress={() => void sync.syncNow()}
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  panel: {
    gap: space.sm,
    padding: space.md,
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    marginBottom: space.md,
  },
  outdated: {
    gap: space.xs,
    padding: space.sm,
    backgroundColor: colors.dangerSoft,
    borderRadius: radii.sm,
  },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md },
  words: { flex: 1, gap: space.xs },
});
