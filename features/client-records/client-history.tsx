import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate, formatDateTime } from '@/ui/format';
import { Panel } from '@/ui/panel';
import { packageStatusWords, visitStatusLook } from '@/ui/status-words';
import { colors, radii, space } from '@/ui/theme';
import { useConsentTextsQuery } from '@/features/settings/api';
import type { ClientRecord } from '@/shared/protocol/practice';

type Visit = ClientRecord['visits'][number];
type Consent = ClientRecord['consents'][number];

const visitColumns: readonly Column<Visit>[] = [
  {
    key: 'when',
    title: 'Visit',
    flex: 1.4,
    render: (v) => <Cell strong>{formatDateTime(v.startedAt)}</Cell>,
  },
  { key: 'status', title: 'Status', render: (v) => <Badge {...visitStatusLook(v.status)} /> },
  { key: 'operator', title: 'Recorded by', render: (v) => <Cell>{v.operatorName ?? '—'}</Cell> },
  { key: 'sites', title: 'Sites recorded', render: (v) => <Cell figures>{v.sitesRecorded} of 4</Cell> },
  {
    key: 'follow',
    title: 'Follow-up',
    render: (v) => <Cell muted={!v.followUpDate}>{formatDate(v.followUpDate)}</Cell>,
  },
];

// What the practice side adds: which consent each visit was recorded under and how it was paid.
const practiceColumns: readonly Column<Visit>[] = [
  ...visitColumns.slice(0, 4),
  {
    key: 'consent',
    title: 'Consent signed',
    render: (v) => <Cell>{v.consentVersion === null ? '—' : `version ${v.consentVersion}`}</Cell>,
  },
  {
    key: 'paid',
    title: 'Paid',
    render: (v) => (v.paidFromPackage ? <Badge label="from package" tone="good" /> : <Cell muted>—</Cell>),
  },
  ...visitColumns.slice(4),
];

/**
 * A client's visits, newest first: the practitioner opens one to review it (`onOpen`); the admin's record adds
 * the consent and payment of each (`practice`).
 */
export function VisitHistory({
  visits,
  wide,
  detail,
  practice = false,
  onOpen,
}: {
  visits: Visit[];
  wide: boolean;
  detail: string;
  practice?: boolean;
  onOpen?: (visit: Visit) => void;
}) {
  return (
    <Panel title="Visits" detail={detail} testID="client-visit-list">
      {visits.length === 0 ? (
        <AppText color={colors.textMuted} testID="client-visit-list-empty">
          No visits recorded yet.
        </AppText>
      ) : (
        <DataTable
          rows={visits}
          columns={practice ? practiceColumns : visitColumns}
          rowKey={(v) => v.sessionId}
          rowTestID={(v) => `client-visit-${v.sessionId}`}
          wide={wide}
          testID="client-visit-table"
          onRowPress={onOpen}
        />
      )}
    </Panel>
  );
}

function ConsentLine({ consent }: { consent: Consent }) {
  const [open, setOpen] = useState(false);
  const texts = useConsentTextsQuery();
  const text = texts.data?.find((t) => t.version === consent.textVersion);
  return (
    <View style={styles.consent} testID={`client-consent-${consent.id}`}>
      <View style={styles.consentHead}>
        <View style={styles.grow}>
          <AppText variant="smallStrong" color={colors.ink}>
            Signed “{consent.typedName}” on {formatDate(consent.consentDate)}
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            {consent.textTitle} · version {consent.textVersion} · recorded {formatDate(consent.recordedAt)}
          </AppText>
        </View>
        {text?.isCurrent ? <Badge label="current text" tone="good" /> : <Badge label="earlier text" />}
        <Pressable
          onPress={() => setOpen((o) => !o)}
          accessibilityRole="button"
          testID={`client-consent-toggle-${consent.id}`}
        >
          <AppText variant="smallStrong" color={colors.accent}>
            {open ? 'Hide text' : 'Show text'}
          </AppText>
        </Pressable>
      </View>
      {open ? (
        <View style={styles.consentText}>
          <AppText variant="small" color={colors.text} testID={`client-consent-text-${consent.id}`}>
            {texts.isPending
              ? 'Loading the text…'
              : texts.isError
                ? `Could not load the text: ${texts.error.message}`
                : (text?.body ?? 'This version of the text is no longer on the server.')}
          </AppText>
        </View>
      ) : null}
    </View>
  );
}

export function ConsentHistory({ consents }: { consents: Consent[] }) {
  return (
    <Panel
      title="Consent"
      detail="Each consent the client gave, with the version of the text they signed."
      testID="client-consents"
    >
      {consents.length === 0 ? (
        <AppText color={colors.caution} testID="client-consents-empty">
          No consent on file: the operator records it before the next session.
        </AppText>
      ) : (
        consents.map((c) => <ConsentLine key={c.id} consent={c} />)
      )}
    </Panel>
  );
}

export function PackageList({ packages }: { packages: ClientRecord['packages'] }) {
  return (
    <Panel
      title="Packages"
      detail="Visits paid ahead; each recorded session uses one."
      testID="client-packages"
    >
      {packages.length === 0 ? (
        <AppText color={colors.textMuted} testID="client-packages-empty">
          No packages. Sell one from Billing.
        </AppText>
      ) : (
        packages.map((p) => (
          <View key={p.id} style={styles.pkg} testID={`client-package-${p.id}`}>
            <View style={styles.grow}>
              <AppText variant="smallStrong" color={colors.ink}>
                {p.description}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                Bought {formatDate(p.createdAt)} · {p.visitsUsed} of {p.visitsTotal} used
              </AppText>
            </View>
            <AppText variant="number" color={colors.ink}>
              {p.visitsLeft} left
            </AppText>
            <Badge {...packageStatusWords[p.status]} />
          </View>
        ))
      )}
    </Panel>
  );
}

const styles = StyleSheet.create({
  grow: { flex: 1, minWidth: 180 },
  consent: {
    gap: space.sm,
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.surfaceMuted,
  },
  consentHead: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  consentText: { backgroundColor: colors.paper, borderRadius: radii.sm, padding: space.md },
  pkg: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    flexWrap: 'wrap',
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.surfaceMuted,
  },
});
