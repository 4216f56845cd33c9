import { Link, useLocalSearchParams } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { Badge } from '@/components/ui/badge';
import { CautionNote } from '@/components/ui/caution-note';
import { ScreenFrame } from '@/components/ui/screen-frame';
import { ErrorState, LoadingState } from '@/components/ui/state-views';
import { colors, radii, space } from '@/constants/theme';
import { useConflictQuery, useResolveConflictMutation } from '@/hooks/api/conflicts';
import { useLayout } from '@/hooks/use-layout';
import type { ConflictDetail } from '@/shared/protocol/sync';
import { entityWords, fieldLabel, shortDevice, whenText } from './conflict-words';
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

function Resolved({ resolution }: { resolution: NonNullable<ConflictDetail['resolution']> }) {
  return (
    <View style={styles.resolved} testID="conflict-resolved" accessibilityRole="summary">
      <AppText variant="bodyStrong" color={colors.pulse}>
        ✓ Resolved by {resolution.resolvedBy ?? 'an admin'} on {whenText(resolution.resolvedAt)}
      </AppText>
      <AppText variant="small" color={colors.text}>
        The row is now at version {resolution.newVersion}; every device takes it on its next sync.
      </AppText>
      <AppText variant="small" color={colors.text} testID="conflict-resolved-note">
        Note: {resolution.note}
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
      subtitle={`${entityWords[c.entity]} ${c.rowId.slice(0, 8)} · stale change from ${c.userName ?? 'unknown'} (${shortDevice(c.deviceId)}) on ${whenText(c.createdAt)}`}
      testID="conflict-detail"
      header={
        <View style={styles.headerRow}>
          <Link href="/conflicts" testID="conflict-back">
            <AppText variant="smallStrong" color={colors.accent}>
              ← All conflicts
            </AppText>
          </Link>
          <Badge
            label={c.status === 'open' ? 'OPEN' : 'RESOLVED'}
            tone={c.status === 'open' ? 'caution' : 'good'}
            testID="conflict-status"
          />
        </View>
      }
    >
      <AppText variant="small" color={colors.text} testID="conflict-differing">
        {c.differingFields.length
          ? `Differing: ${c.differingFields.map(fieldLabel).join(', ')}. Nothing was overwritten: both versions are kept until you choose.`
          : 'No field differs any more; resolving records the server’s row as the version of record.'}
      </AppText>
      <VersionsSideBySide conflict={c} wide={isWide} />
      {c.resolution ? (
        <Resolved resolution={c.resolution} />
      ) : (
        <ResolveForm
          differing={differingOf(c)}
          wide={isWide}
          busy={resolve.isPending}
          serverError={resolve.isError ? resolve.error.message : null}
          onSubmit={(request) => resolve.mutate(request)}
        />
      )}
      {c.entity === 'site_recordings' || c.entity === 'recording_sessions' ? <CautionNote compact /> : null}
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
