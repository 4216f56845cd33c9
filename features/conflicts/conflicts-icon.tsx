import Svg, { Path } from 'react-native-svg';
import type { IconProps } from '@/ui/icons';

const stroke = { strokeWidth: 1.8, strokeLinecap: 'round', strokeLinejoin: 'round', fill: 'none' } as const;

/** Two arrows meeting head-on: two versions of one row. */
export function ConflictsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Path d="M3 7h11M10.5 3.5 14 7l-3.5 3.5" stroke={color} {...stroke} />
      <Path d="M21 17H10M13.5 13.5 10 17l3.5 3.5" stroke={color} {...stroke} />
    </Svg>
  );
}
