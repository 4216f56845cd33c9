import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { SignOutIcon } from '@/components/ui/icons';
import { useAuth } from '@/hooks/auth/auth-context';

export function SignOutButton({ onInk = false }: { onInk?: boolean }) {
  const { signOut } = useAuth();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      label="Sign out"
      testID="sign-out-button"
      variant={onInk ? 'on-ink' : 'secondary'}
      busy={busy}
      icon={(color) => <SignOutIcon color={color} />}
      onPress={() => {
        setBusy(true);
        void signOut();
      }}
    />
  );
}
