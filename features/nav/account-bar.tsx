import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { BrandMark } from '@/ui/icons';
import { colors, space } from '@/ui/theme';
import { useAuth } from '@/features/auth/auth-context';
import { SignOutButton } from './sign-out-button';

/** The phone's top bar: who is signed in, and sign-out (the side navigation holds these on wide screens). */
export function AccountBar() {
  const auth = useAuth();
  return (
    <>
      <View style={styles.brand}>
        <BrandMark size={28} color={colors.ink} accent={colors.accent} />
        <View>
          <AppText variant="smallStrong" color={colors.ink} testID="signed-in-name">
            {auth.user?.name ?? ''}
          </AppText>
          <AppText variant="caption" color={colors.textMuted}>
            Fourpoint
          </AppText>
        </View>
      </View>
      <SignOutButton />
    </>
  );
}

const styles = StyleSheet.create({
  brand: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
