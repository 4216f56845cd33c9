import { QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Stack } from 'expo-router';
import { useState } from 'react';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { Splash } from '@/features/auth/splash';
import { colors } from '@/ui/theme';
import { AuthProvider } from '@/features/auth/auth-provider';
import { makeQueryClient } from '@/api/query-client';
import { appFonts } from './app-fonts';
import { UpdateBanner } from './update-banner';

export function AppRoot() {
  const [queryClient] = useState(makeQueryClient);
  const [fontsLoaded, fontError] = useFonts(appFonts);
  // A font that fails to load falls back to the system face rather than blocking the app.
  const ready = fontsLoaded || fontError !== null;

  return (
    <SafeAreaProvider>
      <QueryClientProvider client={queryClient}>
        <AuthProvider>
          {ready ? (
            <>
              <UpdateBanner />
              <Stack
                screenOptions={{ headerShown: false, contentStyle: { backgroundColor: colors.paper } }}
              />
            </>
          ) : (
            <Splash />
          )}
        </AuthProvider>
      </QueryClientProvider>
    </SafeAreaProvider>
  );
}
