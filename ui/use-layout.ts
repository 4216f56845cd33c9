import { useWindowDimensions } from 'react-native';
import { wideBreakpoint } from './theme';

export type LayoutKind = 'phone' | 'wide';

export function layoutForWidth(width: number): LayoutKind {
  return width >= wideBreakpoint ? 'wide' : 'phone';
}

export function useLayout(): { kind: LayoutKind; isWide: boolean; width: number; height: number } {
  const { width, height } = useWindowDimensions();
  const kind = layoutForWidth(width);
  return { kind, isWide: kind === 'wide', width, height };
}
