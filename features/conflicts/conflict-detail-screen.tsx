import { Link, useLocalSearchParams } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { CautionLine } from '@/ui/caution-line';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { conflictStatusWords } from '@/ui/status-words';
import { colors, radii, space } from '@/ui/theme';
import { useConflictQuery, useResolveConflictMutation } from './api';
import { useLayout } from '@/ui/use-layout';
import type { ConflictDetail } from '@/shared/protocol/sync';
import { changedBy, entityWords, fieldLabel, whenText } from './conflict-words';
import type { DifferingField } from './field-picker';
import { ResolveForm } from './resolve-form';
import { VersionsSideBySide } from './versions-side-by-side';

export function differingOf(conflict: ConflictDetail): DifferingField[] {
  return conflict.differingFields.map((field) => ({
    field,
    server: field === 'deletedAt' ? conflict.server.deletedAt : conflict.server.data[field],
    client: field === 'deletedAt' ? conflict.client.deletedAt : conflict.client.data[field],
  }));
}

/** A settled conflict in words: whose side each field kept, who settled it, when, and why. */
function Settled({ conflict }: { conflict: ConflictDetail }) {
  const resolution = conflict.resolution!;
  const fieldsKeptFrom = (side: 'server' | 'client') =>
    Object.entries(resolution.kept)
      .filter(([, kept]) => kept === side)
      .map(([field]) => fieldLabel(field));
  const fromRecord = fieldsKeptFrom('server');
  const fromChange = fieldsKeptFrom('client');
  return (
    <View style={styles.resolved} testID="conflict-resolved" accessibilityRole="summary">
      <AppText variant="bodyStrong" color={colors.pulse} testID="conflict-resolved-by">
        ✓ Settled by {resolution.resolvedBy ?? 'an admin'} on {whenText(resolution.resolvedAt)}
      </AppText>
      {fromRecord.length ? (
        <AppText variant="small" color={colors.text} testID="conflict-kept-server">
          Kept from the clinic’s record ({changedBy(conflict.serverUserName)}): {fromRecord.join(', ')}
        </AppText>
      ) : null}
      {fromChange.length ? (
        <AppText variant="small" color={colors.text} testID="conflict-kept-client">
          Kept from {changedBy(conflict.userName)}’s change: {fromChange.join(', ')}
        </AppText>
      ) : null}
      {!fromRecord.length && !fromChange.length ? (
        <AppText variant="small" color={colors.text}>
          Nothing differed any more, so the clinic’s record stayed as it was.
        </AppText>
      ) : null}
      <AppText variant="small" color={colors.text} testID="conflict-resolved-note">
        Note: {resolution.note}
      </AppText>
      <AppText variant="small" color={colors.textMuted}>
        Every phone takes the settled record on its next sync.
      </AppText>
    </View>
  );
}

export function ConflictDetailScreen() {
  const { conflictId } = useLocalSearchParams<{ conflictId: string }>();
  const conflict = useConflictQuery(conflictId);
  const resolve = useResolveConflictMutation(conflictId);
  const { isWide } = useLayout();

  if (conflict.isPending) return <LoadingState label="Loading the conflict…" testID="conflict-loading" />;
  if (conflict.isError) {
    return (
      <ErrorState
        message={conflict.error.message}
        onRetry={() => void conflict.refetch()}
        testID="conflict-error"
      />
    );
  }
  const c = conflict.data;

  return (
    <ScreenFrame
      title={c.label || entityWords[c.entity]}
      subtitle={`${entityWords[c.entity]} · changed by ${changedBy(c.userName)} on ${whenText(c.createdAt)}, while the clinic’s record had changed too`}
      testID="conflict-detail"
      header={
        <View style={styles.headerRow}>
          <Link href="/conflicts" testID="conflict-back">
            <AppText variant="smallStrong" color={colors.accent}>
              ← All conflicts
            </AppText>
          </Link>
          <Badge {...conflictStatusWords[c.status]} testID="conflict-status" />
        </View>
      }
    >
      {c.resolution ? (
        <>
          <Settled conflict={c} />
          <VersionsSideBySide conflict={c} wide={isWide} />
        </>
      ) : (
        <>
          <AppText variant="small" color={colors.text} testID="conflict-differing">
            {c.differingFields.length
              ? `Differs in: ${c.differingFields.map(fieldLabel).join(', ')}. Nothing was overwritten: the record and the change are both kept until you choose.`
              : 'Nothing differs any more; settling keeps the clinic’s record as it is.'}
          </AppText>
          <VersionsSideBySide conflict={c} wide={isWide} />
          <ResolveForm
            differing={differingOf(c)}
            wide={isWide}
            busy={resolve.isPending}
            serverError={resolve.isError ? resolve.error.message : null}
            onSubmit={(request) => resolve.mutate(request)}
          />
        </>
      )}
      {c.entity === 'site_recordings' || c.entity === 'recording_sessions' ? <CautionLine /> : null}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  headerRow: { flexDirection: 'row', alignItems: 'center', gap: space.lg, marginTop: space.xs },
  resolved: {
    backgroundColor: colors.pulseSoft,
    borderColor: colors.pulse,
    borderWidth: 1,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.xs,
  },
});
