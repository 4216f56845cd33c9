import type { TextStyle } from 'react-native';

// Fourpoint's own look: deep petrol ink on warm paper, a lagoon-blue accent for the main action, a mint pulse for
// good takes, and a red kept for what cannot be undone. The accent sits far from the danger red in hue, so a
// primary button never reads as a destructive one.
export const colors = {
  ink: '#12343B',
  inkSoft: '#2A4F57',
  paper: '#F6F3EC',
  surface: '#FFFFFF',
  surfaceMuted: '#EEE9DE',
  line: '#DCD4C4',
  text: '#182428',
  textMuted: '#5A6669',
  textOnInk: '#F6F3EC',
  textOnInkMuted: '#A9C1C4',
  accent: '#1F6E8C',
  accentPressed: '#17556D',
  textOnAccent: '#FFFFFF',
  pulse: '#2E8C7E',
  pulseSoft: '#DDF0EA',
  caution: '#8A5A0B',
  cautionSoft: '#FBF0D6',
  cautionLine: '#E6C987',
  danger: '#B42318',
  dangerPressed: '#8F1C13',
  dangerSoft: '#FBE4E1',
  focus: '#4B8FD6',
} as const;

export const fonts = {
  heading: 'SpaceGrotesk_600SemiBold',
  headingBold: 'SpaceGrotesk_700Bold',
  body: 'Inter_400Regular',
  bodyMedium: 'Inter_500Medium',
  bodySemiBold: 'Inter_600SemiBold',
  mono: 'IBMPlexMono_400Regular',
} as const;

const tabularFigures: TextStyle['fontVariant'] = ['tabular-nums'];

export const type = {
  display: { fontFamily: fonts.headingBold, fontSize: 32, lineHeight: 38 },
  title: { fontFamily: fonts.heading, fontSize: 24, lineHeight: 30 },
  heading: { fontFamily: fonts.heading, fontSize: 18, lineHeight: 24 },
  body: { fontFamily: fonts.body, fontSize: 16, lineHeight: 24 },
  bodyStrong: { fontFamily: fonts.bodySemiBold, fontSize: 16, lineHeight: 24 },
  small: { fontFamily: fonts.body, fontSize: 14, lineHeight: 20 },
  smallStrong: { fontFamily: fonts.bodySemiBold, fontSize: 14, lineHeight: 20 },
  caption: { fontFamily: fonts.bodyMedium, fontSize: 12, lineHeight: 16, letterSpacing: 0.4 },
  // Figures in the body face with tabular (equal-width) digits, so columns line up without a typewriter look.
  number: { fontFamily: fonts.body, fontSize: 14, lineHeight: 20, fontVariant: tabularFigures },
  numberLarge: { fontFamily: fonts.bodySemiBold, fontSize: 28, lineHeight: 34, fontVariant: tabularFigures },
} as const;

export const space = { xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32, xxxl: 48 } as const;

export const radii = { sm: 6, md: 10, lg: 16, pill: 999 } as const;

/** Window widths at or above this get the wide layout (side navigation, tables). */
export const wideBreakpoint = 900;

export const sideNavWidth = 248;
