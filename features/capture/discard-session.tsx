import { AskFirst } from '@/ui/confirm-step';

type Props = { clientName: string; busy: boolean; error: string | null; onDiscard: () => void };

/** Leaves an unfinished session without keeping it, after saying what that deletes. */
export function DiscardSession({ clientName, busy, error, onDiscard }: Props) {
  return (
    <AskFirst
      label="Discard this session…"
      variant="ghost"
      testID="discard-session"
      question={`Discard the session${clientName ? ` for ${clientName}` : ''}?`}
      confirmLabel="Discard"
      cancelLabel="Keep recording"
      tone="danger"
      busy={busy}
      error={error}
      onConfirm={onDiscard}
    >
      The takes recorded so far are deleted from this device. Nothing has been sent to the clinic yet, so
      nothing else changes; consent stays on file.
    </AskFirst>
  );
}
