import type { FontSource } from 'expo-font';
import type { fonts } from '@/ui/theme';

// The web target's faces: WOFF2 from the Fontsource packages, latin subset, only the weights the theme names
// (a third to a tenth of the TrueType files' size once compressed). Keyed by the theme's family names, so a face
// the theme adds without loading here fails the type check. Characters outside the latin subset fall back to the
// browser's own face.
export const appFonts: Record<(typeof fonts)[keyof typeof fonts], FontSource> = {
  SpaceGrotesk_600SemiBold: require('@fontsource/space-grotesk/files/space-grotesk-latin-600-normal.woff2'),
  SpaceGrotesk_700Bold: require('@fontsource/space-grotesk/files/space-grotesk-latin-700-normal.woff2'),
  Inter_400Regular: require('@fontsource/inter/files/inter-latin-400-normal.woff2'),
  Inter_500Medium: require('@fontsource/inter/files/inter-latin-500-normal.woff2'),
  Inter_600SemiBold: require('@fontsource/inter/files/inter-latin-600-normal.woff2'),
  IBMPlexMono_400Regular: require('@fontsource/ibm-plex-mono/files/ibm-plex-mono-latin-400-normal.woff2'),
};
