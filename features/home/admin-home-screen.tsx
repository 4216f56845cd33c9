import { StyleSheet, View } from 'react-native';
import { roleLabels } from '@/features/nav/role-labels';
import { AppText } from '@/ui/app-text';
import { CautionLine } from '@/ui/caution-line';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { colors, radii, space } from '@/ui/theme';
import { useTeamQuery } from '@/features/team/api';
import { useLayout } from '@/ui/use-layout';
import { roles, type TeamMember } from '@/shared/protocol';
import { AttentionPanel } from './attention-panel';
import { TeamTable } from '@/features/team/team-table';

function Overview({ members }: { members: TeamMember[] }) {
  const active = members.filter((m) => !m.disabled);
  const cards = [
    { key: 'people', label: 'Active people', value: active.length },
    ...roles.map((r) => ({
      key: r,
      label: `${roleLabels[r]}s`,
      value: active.filter((m) => m.role === r).length,
    })),
    { key: 'disabled', label: 'Disabled accounts', value: members.length - active.length },
  ];
  return (
    <View style={styles.cards} testID="admin-overview">
      {cards.map((c) => (
        <View key={c.key} style={styles.card} testID={`overview-${c.key}`}>
          <AppText variant="numberLarge" color={colors.ink}>
            {c.value}
          </AppText>
          <AppText variant="caption" color={colors.textMuted}>
            {c.label.toUpperCase()}
          </AppText>
        </View>
      ))}
    </View>
  );
}

export function AdminHomeScreen() {
  const team = useTeamQuery();
  const { isWide } = useLayout();

  let body;
  if (team.isPending) {
    body = <LoadingState label="Loading the team…" testID="team-loading" />;
  } else if (team.isError) {
    body = (
      <ErrorState message={team.error.message} onRetry={() => void team.refetch()} testID="team-error" />
    );
  } else if (team.data.users.length === 0) {
    body = <EmptyState title="No team members" detail="People you invite appear here." testID="team-empty" />;
  } else {
    body = (
      <>
        <Overview members={team.data.users} />
        <AppText variant="heading" color={colors.ink}>
          Team
        </AppText>
        <TeamTable members={team.data.users} wide={isWide} />
      </>
    );
  }

  return (
    <ScreenFrame
      title="Clinic overview"
      subtitle="What needs you, and who works in this clinic in which role."
      testID="admin-home"
    >
      <AttentionPanel />
      {body}
      <CautionLine />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  cards: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  card: {
    minWidth: 150,
    flexGrow: 1,
    flexBasis: 150,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.xs,
  },
});
