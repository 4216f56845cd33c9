import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { formatDateTime, formatTime } from '@/ui/format';
import { reportMailStatusWords } from '@/ui/status-words';
import { colors, radii, space } from '@/ui/theme';
import {
  downloadReport,
  useReportMailPreviewQuery,
  useReportMailsQuery,
  useRetryMailMutation,
  useSendReportMutation,
} from './api';
import { openReportPreview } from './open-report';

type Props = {
  sessionId: string;
  compareWith: string | null;
  clientEmail: string | null;
  fileName: string;
  canSend: boolean;
};

/** Download the report, e-mail it to the client, and see every send with its state; failed ones retry. */
export function ReportPanel({ sessionId, compareWith, clientEmail, fileName, canSend }: Props) {
  const mails = useReportMailsQuery(sessionId);
  const send = useSendReportMutation(sessionId);
  const retry = useRetryMailMutation(sessionId);
  const [downloadError, setDownloadError] = useState<string | null>(null);
  const [downloading, setDownloading] = useState(false);
  // The e-mail is read before it goes: the first press shows it, "Send now" sends it.
  const [previewing, setPreviewing] = useState(false);
  const preview = useReportMailPreviewQuery(sessionId, compareWith, previewing);
  const [confirmed, setConfirmed] = useState<string | null>(null);
  return (
    <Card style={styles.box} testID="report-panel">
      <AppText variant="heading" color={colors.ink}>
        Report
      </AppText>
      <AppText variant="small" color={colors.textMuted}>
        {compareWith
          ? 'The report includes the comparison with the chosen earlier visit.'
          : 'Pick an earlier visit above to include a comparison.'}
      </AppText>
      <View style={styles.row}>
        <Button
          label="Download PDF"
          variant="secondary"
          testID="report-download"
          busy={downloading}
          onPress={() => {
            setDownloading(true);
            setDownloadError(null);
            downloadReport(sessionId, compareWith, fileName)
              .catch((e: Error) => setDownloadError(e.message))
              .finally(() => setDownloading(false));
          }}
        />
        <Button
          label={clientEmail ? `Preview e-mail to ${clientEmail}` : 'No client e-mail on file'}
          variant={previewing ? 'secondary' : 'primary'}
          testID="report-preview"
          disabled={!clientEmail || !canSend || previewing}
          onPress={() => {
            setConfirmed(null);
            setPreviewing(true);
          }}
        />
      </View>
      {confirmed ? (
        <AppText variant="smallStrong" color={colors.pulse} testID="report-send-confirmed">
          ✓ The report is on its way to {confirmed}. Its delivery shows below.
        </AppText>
      ) : null}
      {previewing ? (
        <View style={styles.preview} testID="report-mail-preview">
          {preview.isPending ? (
            <AppText variant="small" color={colors.textMuted}>
              Preparing the e-mail…
            </AppText>
          ) : preview.isError ? (
            <AppText variant="small" color={colors.danger}>
              {preview.error.message}
            </AppText>
          ) : (
            <>
              <AppText variant="smallStrong" color={colors.ink}>
                To: {preview.data.to} · Subject: {preview.data.subject}
              </AppText>
              <AppText variant="small" color={colors.text} testID="report-mail-preview-body">
                {preview.data.bodyText}
              </AppText>
              <View style={styles.attachment}>
                <AppText variant="caption" color={colors.textMuted} style={styles.flex}>
                  Attached: {preview.data.attachmentName} (the same report as Download PDF)
                </AppText>
                <Button
                  label="Read the PDF"
                  variant="ghost"
                  testID="report-preview-pdf"
                  onPress={() =>
                    void openReportPreview(sessionId, compareWith).catch((e: Error) =>
                      setDownloadError(e.message),
                    )
                  }
                />
              </View>
            </>
          )}
          <View style={styles.row}>
            <Button
              label="Send now"
              testID="report-send"
              disabled={!preview.isSuccess}
              busy={send.isPending}
              onPress={() =>
                send.mutate(
                  { compareWith },
                  {
                    onSuccess: (mail) => {
                      setPreviewing(false);
                      setConfirmed(mail.to);
                    },
                  },
                )
              }
            />
            <Button
              label="Cancel"
              variant="ghost"
              testID="report-preview-cancel"
              onPress={() => setPreviewing(false)}
            />
          </View>
        </View>
      ) : null}
      {downloadError ? (
        <AppText variant="small" color={colors.danger}>
          {downloadError}
        </AppText>
      ) : null}
      {send.isError ? (
        <AppText variant="small" color={colors.danger} testID="report-send-error">
          {send.error.message}
        </AppText>
      ) : null}
      {(mails.data ?? []).length ? (
        <AppText variant="smallStrong" color={colors.ink} testID="report-mail-history">
          Sent to the client
        </AppText>
      ) : null}
      {(mails.data ?? []).map((m) => (
        <View key={m.id} style={styles.mail} testID={`report-mail-${m.state}`}>
          <Badge {...reportMailStatusWords[m.state]} />
          <AppText variant="small" color={colors.text} style={styles.flex}>
            {m.to} · {formatDateTime(m.createdAt)}
            {m.lastError ? ` · ${m.lastError}` : ''}
            {m.state === 'failed'
              ? m.nextAttemptAt
                ? ` · tries again by itself at ${formatTime(m.nextAttemptAt)}`
                : ' · not tried again by itself: check the address, then retry'
              : ''}
          </AppText>
          {m.state === 'failed' && canSend ? (
            <Button
              label="Retry"
              variant="secondary"
              testID={`report-retry-${m.id}`}
              busy={retry.isPending}
              onPress={() => retry.mutate(m.id)}
            />
          ) : null}
        </View>
      ))}
    </Card>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  preview: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.sm,
    padding: space.md,
    gap: space.xs,
  },
  mail: { flexDirection: 'row', gap: space.sm, alignItems: 'center' },
  flex: { flex: 1 },
  attachment: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
});
