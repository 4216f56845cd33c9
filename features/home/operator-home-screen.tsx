import { useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, TextInput, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { CautionLine } from '@/ui/caution-line';
import { SearchIcon } from '@/ui/icons';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { colors, fonts, radii, space } from '@/ui/theme';
import { useClinicConsentText } from '@/device/consent/clinic-consent-text';
import { useLocalClients } from '@/device/local-store/queries';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import { ClientRow } from '@/features/clients/client-row';
import { FollowUpsDue } from './follow-ups-due';
import { OfflineMark } from './offline-mark';

/**
 * The clients kept on this phone: every client of the clinic (pulled at sign-in and whenever the network
 * returns) and those added here. The list reads the phone only, so it is the same online and offline.
 */
export function OperatorHomeScreen() {
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search);
  const consentText = useClinicConsentText();
  const clients = useLocalClients(q, String(consentText.version));
  const router = useRouter();

  const searchBox = (
    <View style={styles.header}>
      <OfflineMark />
      <View style={styles.tools}>
        <View style={styles.search}>
          <SearchIcon color={colors.textMuted} />
          <TextInput
            testID="client-search"
            accessibilityLabel="Search clients"
            placeholder="Search by name or e-mail"
            placeholderTextColor={colors.textMuted}
            value={search}
            onChangeText={setSearch}
            autoCapitalize="none"
            autoCorrect={false}
            style={styles.searchInput}
          />
        </View>
        <Button
          label="New client"
          testID="client-add"
          variant="secondary"
          onPress={() => router.push('/clients/new')}
        />
      </View>
    </View>
  );

  let body;
  if (clients.isPending) {
    body = <LoadingState label="Loading clients…" testID="clients-loading" />;
  } else if (clients.isError) {
    body = (
      <ErrorState
        message={clients.error.message}
        onRetry={() => void clients.refetch()}
        testID="clients-error"
      />
    );
  } else if (clients.data.length === 0) {
    body = q.trim() ? (
      <EmptyState
        title="No match"
        detail={`No client matches “${q.trim()}”. Check the spelling or search by e-mail.`}
        testID="clients-empty"
      />
    ) : (
      <EmptyState
        title="No clients yet"
        detail="Clients of your clinic appear here after the first sync; add a new one with New client."
        testID="clients-empty"
      />
    );
  } else {
    body = (
      <View style={styles.list} testID="clients-list">
        <FollowUpsDue />
        <AppText variant="caption" color={colors.textMuted}>
          {clients.data.length === 1 ? '1 CLIENT' : `${clients.data.length} CLIENTS`}
        </AppText>
        {clients.data.map((c) => (
          <ClientRow key={c.id} client={c} />
        ))}
      </View>
    );
  }

  return (
    <ScreenFrame
      title="Clients"
      subtitle="Find the client, then record the four sites."
      testID="operator-home"
      header={searchBox}
    >
      {body}
      <CautionLine />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  header: { gap: space.sm, marginTop: space.sm },
  tools: { flexDirection: 'row', gap: space.sm, maxWidth: 640, alignItems: 'center' },
  search: {
    flex: 1,
    minWidth: 0,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    paddingHorizontal: space.md,
  },
  searchInput: {
    flex: 1,
    minWidth: 0,
    width: '100%',
    minHeight: 46,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.text,
  },
  list: { gap: space.sm, maxWidth: 640 },
});
