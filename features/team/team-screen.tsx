import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { FormTextField } from '@/ui/form-text-field';
import { formatDateTime } from '@/ui/format';
import { invitationStatusWords } from '@/ui/status-words';
import { colors, radii, space } from '@/ui/theme';
import {
  useInviteMutation,
  useRevokeInvitationMutation,
  useTeamQuery,
  useUpdateTeamUserMutation,
} from './api';
import { roles, type Role } from '@/shared/protocol';
import { inviteRequestSchema, type InviteRequest } from '@/shared/protocol/practice';

function RolePicker({
  value,
  onChange,
  testID,
}: {
  value: Role;
  onChange: (r: Role) => void;
  testID: string;
}) {
  return (
    <View style={styles.row} testID={testID}>
      {roles.map((r) => (
        <Pressable
          key={r}
          onPress={() => onChange(r)}
          style={[styles.chip, value === r && styles.chipOn]}
          testID={`${testID}-${r}`}
          accessibilityRole="button"
        >
          <AppText variant="small" color={value === r ? colors.textOnInk : colors.ink}>
            {r}
          </AppText>
        </Pressable>
      ))}
    </View>
  );
}

/** Users and roles; invitations go out by e-mail and the invitee sets their own password. */
export function TeamScreen() {
  const team = useTeamQuery();
  const invite = useInviteMutation();
  const update = useUpdateTeamUserMutation();
  const revoke = useRevokeInvitationMutation();
  const form = useForm<InviteRequest>({
    resolver: zodResolver(inviteRequestSchema),
    defaultValues: { email: '', name: '', role: 'practitioner' },
  });
  const submit = form.handleSubmit((values) =>
    invite.mutate(values, { onSuccess: () => form.reset({ email: '', name: '', role: values.role }) }),
  );

  return (
    <ScreenFrame title="Team" subtitle="Who signs in to this clinic, and as what" testID="team-screen">
      <View style={styles.card}>
        <AppText variant="heading" color={colors.ink}>
          Invite someone
        </AppText>
        <View style={styles.formRow}>
          <FormTextField control={form.control} name="name" label="Name" testID="invite-name" />
          <FormTextField
            control={form.control}
            name="email"
            label="E-mail"
            testID="invite-email"
            autoCapitalize="none"
          />
        </View>
        <Controller
          control={form.control}
          name="role"
          render={({ field }) => (
            <RolePicker value={field.value} onChange={field.onChange} testID="invite-role" />
          )}
        />
        <Button
          label={invite.isPending ? 'Sending…' : 'Send invitation'}
          onPress={() => void submit()}
          testID="invite-send"
          disabled={invite.isPending}
        />
        {invite.isError ? (
          <AppText color={colors.danger} testID="invite-error">
            {invite.error.message}
          </AppText>
        ) : null}
        {invite.isSuccess ? (
          <AppText color={colors.pulse} testID="invite-sent">
            {invite.data.emailed
              ? `Invitation e-mailed to ${invite.data.invitation.email}.`
              : 'Invitation made, but the e-mail could not be sent; try again.'}
          </AppText>
        ) : null}
      </View>
      {team.isPending ? (
        <LoadingState label="Loading the team…" testID="team-loading" />
      ) : team.isError ? (
        <ErrorState message={team.error.message} onRetry={() => void team.refetch()} testID="team-error" />
      ) : (
        <>
          <View style={styles.card} testID="team-users">
            {team.data.users.map((u) => (
              <View key={u.id} style={styles.userRow} testID={`team-user-${u.email}`}>
                <View style={styles.grow}>
                  <AppText variant="bodyStrong" color={colors.ink}>
                    {u.name}
                  </AppText>
                  <AppText variant="small" color={colors.textMuted}>
                    {u.email}
                  </AppText>
                </View>
                {u.disabled ? <Badge label="disabled" tone="danger" /> : null}
                <RolePicker
                  value={u.role}
                  onChange={(role) => update.mutate({ id: u.id, change: { role } })}
                  testID={`team-role-${u.email}`}
                />
                <Button
                  label={u.disabled ? 'Enable' : 'Disable'}
                  variant="secondary"
                  onPress={() => update.mutate({ id: u.id, change: { disabled: !u.disabled } })}
                  testID={`team-toggle-${u.email}`}
                />
              </View>
            ))}
            {update.isError ? (
              <AppText color={colors.danger} testID="team-update-error">
                {update.error.message}
              </AppText>
            ) : null}
          </View>
          <View style={styles.card} testID="team-invitations">
            <AppText variant="heading" color={colors.ink}>
              Invitations
            </AppText>
            {team.data.invitations.length === 0 ? (
              <AppText color={colors.textMuted}>None yet.</AppText>
            ) : null}
            {team.data.invitations.map((i) => (
              <View key={i.id} style={styles.userRow}>
                <View style={styles.grow}>
                  <AppText variant="bodyStrong" color={colors.ink}>
                    {i.name} · {i.role}
                  </AppText>
                  <AppText variant="small" color={colors.textMuted}>
                    {i.email} · expires {formatDateTime(i.expiresAt)}
                  </AppText>
                </View>
                <Badge {...invitationStatusWords[i.status]} />
                {i.status === 'pending' ? (
                  <Button
                    label="Withdraw"
                    variant="secondary"
                    onPress={() => revoke.mutate(i.id)}
                    testID={`invitation-withdraw-${i.email}`}
                  />
                ) : null}
              </View>
            ))}
          </View>
        </>
      )}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.md,
    marginBottom: space.lg,
    borderWidth: 1,
    borderColor: colors.line,
  },
  formRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  row: { flexDirection: 'row', gap: space.xs },
  chip: {
    paddingHorizontal: space.sm,
    paddingVertical: space.xs,
    borderRadius: radii.sm,
    borderWidth: 1,
    borderColor: colors.line,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
  userRow: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingVertical: space.sm,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
    flexWrap: 'wrap',
  },
  grow: { flexGrow: 1, minWidth: 200 },
});
