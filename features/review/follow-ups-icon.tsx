import Svg, { Line, Path, Rect } from 'react-native-svg';
import type { IconProps } from '@/ui/icons';

const stroke = { strokeWidth: 1.8, strokeLinecap: 'round', strokeLinejoin: 'round', fill: 'none' } as const;

/** A calendar page with a tick: a return visit that is due. */
export function FollowUpsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Rect x={3} y={5} width={18} height={16} rx={3} stroke={color} {...stroke} />
      <Line x1={3} y1={10} x2={21} y2={10} stroke={color} {...stroke} />
      <Line x1={8} y1={3} x2={8} y2={7} stroke={color} {...stroke} />
      <Line x1={16} y1={3} x2={16} y2={7} stroke={color} {...stroke} />
      <Path d="M8.5 15.5l2.3 2.2 4.7-4.7" stroke={color} {...stroke} />
    </Svg>
  );
}
