import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { ScreenFrame } from '@/ui/screen-frame';
import { formatDateTime } from '@/ui/format';
import { LinkedText } from '@/ui/linked-text';
import { ErrorState, LoadingState, QueryView } from '@/ui/state-views';
import { colors, radii, space } from '@/ui/theme';
import { openAttachment, useMailboxMessageQuery, useMailboxQuery } from './api';
import { useLayout } from '@/ui/use-layout';

/** What the local mail fake received: every message the server sent, with its attachments. */
export function MailboxScreen() {
  const list = useMailboxQuery();
  const [selected, setSelected] = useState<string | null>(null);
  const message = useMailboxMessageQuery(selected);
  const [attachmentError, setAttachmentError] = useState<string | null>(null);
  const { isWide } = useLayout();

  const body = (
    <QueryView
      query={list}
      loading="Reading the mailbox…"
      testID="mailbox"
      empty={{
        title: 'No mail yet',
        detail: 'Invitations, reminders and reports sent by the server land here.',
      }}
    >
      {(messages) => (
        <View style={[styles.split, isWide && styles.splitWide]}>
          <View style={[styles.list, isWide && styles.listWide]} testID="mailbox-list">
            {messages.map((m) => (
              <Pressable
                key={m.id}
                onPress={() => setSelected(m.id)}
                style={[styles.item, selected === m.id && styles.itemOn]}
                testID={`mailbox-message-${m.id}`}
                accessibilityRole="button"
              >
                <AppText variant="smallStrong" color={colors.ink} numberOfLines={1}>
                  {m.subject}
                </AppText>
                <AppText variant="caption" color={colors.textMuted}>
                  to {m.to} · {formatDateTime(m.receivedAt)}{' '}
                  {m.attachments.length ? `· ${m.attachments.length} attachment(s)` : ''}
                </AppText>
              </Pressable>
            ))}
          </View>
          <View style={styles.reader} testID="mailbox-reader">
            {!selected ? (
              <AppText variant="small" color={colors.textMuted}>
                Pick a message to read it.
              </AppText>
            ) : message.isPending ? (
              <LoadingState label="Opening…" testID="mailbox-message-loading" />
            ) : message.isError ? (
              <ErrorState
                message={message.error.message}
                onRetry={() => void message.refetch()}
                testID="mailbox-message-error"
              />
            ) : (
              <>
                <AppText variant="heading" color={colors.ink} testID="mailbox-subject">
                  {message.data.subject}
                </AppText>
                <AppText variant="small" color={colors.textMuted}>
                  From {message.data.from} to {message.data.to}
                </AppText>
                <LinkedText text={message.data.text ?? '(This e-mail has no text.)'} testID="mailbox-body" />
                {message.data.attachments.map((a) => (
                  <View key={a.index} style={styles.attachment} testID={`mailbox-attachment-${a.index}`}>
                    <AppText variant="small" color={colors.ink} style={styles.flex}>
                      📎 {a.filename ?? 'Attachment'}
                    </AppText>
                    <Button
                      label="Open"
                      variant="secondary"
                      testID={`mailbox-open-${a.index}`}
                      onPress={() =>
                        openAttachment(message.data.id, a.index).catch((e: Error) =>
                          setAttachmentError(e.message),
                        )
                      }
                    />
                  </View>
                ))}
                {attachmentError ? (
                  <AppText variant="small" color={colors.danger}>
                    {attachmentError}
                  </AppText>
                ) : null}
              </>
            )}
          </View>
        </View>
      )}
    </QueryView>
  );

  return (
    <ScreenFrame
      title="Mailbox"
      subtitle="The local stand-in for the mail relay: what the server has sent."
      testID="mailbox-screen"
    >
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  split: { gap: space.md },
  splitWide: { flexDirection: 'row', alignItems: 'flex-start' },
  list: { gap: space.xs },
  listWide: { width: 380 },
  item: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    gap: 2,
  },
  itemOn: { borderColor: colors.ink },
  reader: {
    flex: 1,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.sm,
  },
  attachment: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  flex: { flex: 1 },
});
