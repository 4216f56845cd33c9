import { StyleSheet, View } from 'react-native';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { useClinicKeyPrefetch, useOutbox } from '@/device/local-store/queries';
import { OutboxList } from './outbox-list';
import { SyncPanel } from './sync-panel';

export function OutboxScreen() {
  useClinicKeyPrefetch();
  const outbox = useOutbox();
  let body;
  if (outbox.isPending) body = <LoadingState label="Reading the outbox…" testID="outbox-loading" />;
  else if (outbox.isError)
    body = (
      <ErrorState
        message={outbox.error.message}
        onRetry={() => void outbox.refetch()}
        testID="outbox-error-state"
      />
    );
  else if (outbox.data.length === 0)
    body = (
      <EmptyState
        title="Nothing to send"
        detail="Finished sessions and new clients wait here, sealed, until the phone reaches the clinic."
        testID="outbox-empty"
      />
    );
  else body = <OutboxList items={outbox.data} />;
  return (
    <ScreenFrame
      title="Outbox"
      subtitle="Sealed recordings and records, sent when the clinic can be reached."
      testID="outbox-screen"
    >
      <View style={styles.column}>
        <SyncPanel />
        {body}
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  column: { maxWidth: 720, width: '100%' },
});
