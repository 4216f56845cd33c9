import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { CautionNote } from '@/components/ui/caution-note';
import { ScreenFrame } from '@/components/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-views';
import { colors, radii, space } from '@/constants/theme';
import { useSessionsQuery } from '@/hooks/data/sessions';
import { useLayout } from '@/hooks/use-layout';
import { SessionsCards, SessionsTable } from './sessions-table';
import { SiteLegend } from './site-chips';

function Stat({ label, value, testID }: { label: string; value: number; testID: string }) {
  return (
    <View style={styles.stat} testID={testID}>
      <AppText variant="numberLarge" color={colors.ink}>
        {value}
      </AppText>
      <AppText variant="caption" color={colors.textMuted}>
        {label.toUpperCase()}
      </AppText>
    </View>
  );
}

export function PractitionerHomeScreen() {
  const sessions = useSessionsQuery();
  const { isWide } = useLayout();

  let body;
  if (sessions.isPending) {
    body = <LoadingState label="Loading sessions…" testID="sessions-loading" />;
  } else if (sessions.isError) {
    body = (
      <ErrorState
        message={sessions.error.message}
        onRetry={() => void sessions.refetch()}
        testID="sessions-error"
      />
    );
  } else if (sessions.data.length === 0) {
    body = (
      <EmptyState
        title="No sessions yet"
        detail="Sessions appear here once a device has synced them."
        testID="sessions-empty"
      />
    );
  } else {
    const list = sessions.data;
    body = (
      <>
        <View style={styles.stats}>
          <Stat label="Sessions" value={list.length} testID="stat-sessions" />
          <Stat
            label="Ready for review"
            value={list.filter((s) => s.status === 'completed').length}
            testID="stat-to-review"
          />
          <Stat
            label="Reviewed"
            value={list.filter((s) => s.status === 'reviewed').length}
            testID="stat-reviewed"
          />
        </View>
        {isWide ? <SessionsTable sessions={list} /> : <SessionsCards sessions={list} />}
        <SiteLegend />
      </>
    );
  }

  return (
    <ScreenFrame
      title="Recent sessions"
      subtitle="Synced sessions from the clinic's devices, newest first."
      testID="practitioner-home"
    >
      <CautionNote compact={!isWide} />
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  stats: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  stat: {
    flexBasis: 96,
    flexGrow: 1,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.xs,
  },
});
