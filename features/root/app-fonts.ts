import { IBMPlexMono_400Regular } from '@expo-google-fonts/ibm-plex-mono/400Regular';
import { Inter_400Regular } from '@expo-google-fonts/inter/400Regular';
import { Inter_500Medium } from '@expo-google-fonts/inter/500Medium';
import { Inter_600SemiBold } from '@expo-google-fonts/inter/600SemiBold';
import { SpaceGrotesk_600SemiBold } from '@expo-google-fonts/space-grotesk/600SemiBold';
import { SpaceGrotesk_700Bold } from '@expo-google-fonts/space-grotesk/700Bold';
import type { FontSource } from 'expo-font';
import type { fonts } from '@/ui/theme';

// iOS and Android load TrueType only; the web target takes WOFF2 (app-fonts.web.ts). Keyed by the theme's family
// names, so a face the theme adds without loading here fails the type check.
export const appFonts: Record<(typeof fonts)[keyof typeof fonts], FontSource> = {
  SpaceGrotesk_600SemiBold,
  SpaceGrotesk_700Bold,
  Inter_400Regular,
  Inter_500Medium,
  Inter_600SemiBold,
  IBMPlexMono_400Regular,
};
