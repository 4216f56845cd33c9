import { useRouter } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { formatDate } from '@/ui/format';
import { colors, radii, space } from '@/ui/theme';
import type { ListedClient } from '@/device/local-store/clients';

/** A client kept on the phone; the consent badge is for the wording in force, as on the client page. */
export function ClientRow({ client }: { client: ListedClient }) {
  const router = useRouter();
  const initials = `${client.firstName.charAt(0)}${client.lastName.charAt(0)}`.toUpperCase();
  return (
    <Pressable
      style={({ pressed }) => [styles.row, pressed && styles.pressed]}
      testID={`client-row-${client.id}`}
      accessibilityRole="button"
      accessibilityLabel={`${client.firstName} ${client.lastName}`}
      onPress={() => router.push({ pathname: '/clients/[clientId]', params: { clientId: client.id } })}
    >
      <View style={styles.avatar}>
        <AppText variant="smallStrong" color={colors.textOnInk}>
          {initials}
        </AppText>
      </View>
      <View style={styles.main}>
        <AppText variant="bodyStrong" color={colors.ink} numberOfLines={1}>
          {client.firstName} {client.lastName}
        </AppText>
        {client.dateOfBirth ? (
          <AppText variant="number" color={colors.textMuted}>
            born {formatDate(client.dateOfBirth)}
          </AppText>
        ) : (
          <AppText variant="small" color={colors.textMuted}>
            No date of birth on file
          </AppText>
        )}
      </View>
      <View style={styles.badges}>
        <Badge
          label={client.hasConsent ? 'Consent on file' : 'Needs consent'}
          tone={client.hasConsent ? 'good' : 'caution'}
          testID={`client-consent-${client.id}`}
        />
        {client.unsent ? (
          <Badge label="Not yet synced" tone="neutral" testID={`client-unsent-${client.id}`} />
        ) : null}
      </View>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
  },
  pressed: { backgroundColor: colors.surfaceMuted },
  avatar: {
    width: 40,
    height: 40,
    borderRadius: radii.pill,
    backgroundColor: colors.inkSoft,
    alignItems: 'center',
    justifyContent: 'center',
  },
  main: { flex: 1, gap: 2 },
  badges: { alignItems: 'flex-end', gap: space.xs },
});
