import type { ColorValue } from 'react-native';
import Svg, { Circle, Line, Path, Rect } from 'react-native-svg';

export type IconProps = { color: ColorValue; size?: number };

const stroke = { strokeWidth: 1.8, strokeLinecap: 'round', strokeLinejoin: 'round', fill: 'none' } as const;

export function ClientsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={9} cy={8} r={3.5} stroke={color} {...stroke} />
      <Path d="M2.5 20c.8-3.6 3.4-5.5 6.5-5.5s5.7 1.9 6.5 5.5" stroke={color} {...stroke} />
      <Path d="M15.5 4.8a3.3 3.3 0 0 1 0 6.4M18 14.8c1.8.7 3 2.4 3.5 5.2" stroke={color} {...stroke} />
    </Svg>
  );
}

export function AccountIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={12} cy={12} r={9.5} stroke={color} {...stroke} />
      <Circle cx={12} cy={10} r={3.2} stroke={color} {...stroke} />
      <Path d="M6.3 18.6c1.3-2.2 3.3-3.4 5.7-3.4s4.4 1.2 5.7 3.4" stroke={color} {...stroke} />
    </Svg>
  );
}

/** A list of sessions: rows with a small trace on the first. */
export function SessionsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Rect x={3} y={3.5} width={18} height={17} rx={3} stroke={color} {...stroke} />
      <Path d="M6 9h2.5l1.5-3 2 6 1.5-3H18" stroke={color} {...stroke} />
      <Line x1={6} y1={14.5} x2={18} y2={14.5} stroke={color} {...stroke} />
      <Line x1={6} y1={17.5} x2={14} y2={17.5} stroke={color} {...stroke} />
    </Svg>
  );
}

/** A tray with an arrow leaving it: items waiting to sync. */
export function OutboxIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Path
        d="M3.5 13.5h4.5l1.5 3h5l1.5-3h4.5V19a1.5 1.5 0 0 1-1.5 1.5h-14A1.5 1.5 0 0 1 3.5 19z"
        stroke={color}
        {...stroke}
      />
      <Path d="M12 11V3.5M8.8 6.5 12 3.3l3.2 3.2" stroke={color} {...stroke} />
    </Svg>
  );
}

export function OverviewIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Rect x={3.5} y={3.5} width={7} height={7} rx={1.8} stroke={color} {...stroke} />
      <Rect x={13.5} y={3.5} width={7} height={7} rx={1.8} stroke={color} {...stroke} />
      <Rect x={3.5} y={13.5} width={7} height={7} rx={1.8} stroke={color} {...stroke} />
      <Rect x={13.5} y={13.5} width={7} height={7} rx={1.8} stroke={color} {...stroke} />
    </Svg>
  );
}

export function SignOutIcon({ color, size = 18 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Path d="M10 4H6a2 2 0 0 0-2 2v12a2 2 0 0 0 2 2h4" stroke={color} {...stroke} />
      <Path d="M15 8l4 4-4 4M19 12H9" stroke={color} {...stroke} />
    </Svg>
  );
}

export function SearchIcon({ color, size = 18 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={10.5} cy={10.5} r={6.5} stroke={color} {...stroke} />
      <Line x1={15.5} y1={15.5} x2={20.5} y2={20.5} stroke={color} {...stroke} />
    </Svg>
  );
}

export function CautionIcon({ color, size = 18 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={12} cy={12} r={9.5} stroke={color} {...stroke} />
      <Line x1={12} y1={7} x2={12} y2={13} stroke={color} {...stroke} />
      <Circle cx={12} cy={16.6} r={1.1} fill={color} />
    </Svg>
  );
}

/** Fourpoint's mark: four listening points in a diamond joined by one beat. */
export function BrandMark({
  size = 32,
  color,
  accent,
  line = '#F6F3EC',
}: {
  size?: number;
  color: string;
  accent: string;
  line?: string;
}) {
  return (
    <Svg width={size} height={size} viewBox="0 0 32 32">
      <Rect x={1} y={1} width={30} height={30} rx={9} fill={color} />
      <Circle cx={16} cy={7.5} r={2.4} fill={accent} />
      <Circle cx={24.5} cy={16} r={2.4} fill={accent} />
      <Circle cx={16} cy={24.5} r={2.4} fill={accent} />
      <Circle cx={7.5} cy={16} r={2.4} fill={accent} />
      <Path
        d="M10.5 16h2.5l1.5-3.5 3 7 1.5-3.5h2.5"
        stroke={line}
        strokeWidth={1.7}
        strokeLinecap="round"
        strokeLinejoin="round"
        fill="none"
      />
    </Svg>
  );
}

/** Three heads, one in front: the people who sign in to the clinic. */
export function TeamIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={12} cy={9} r={3.2} stroke={color} {...stroke} />
      <Path d="M6.2 19.5c.7-3.1 3-4.8 5.8-4.8s5.1 1.7 5.8 4.8" stroke={color} {...stroke} />
      <Circle cx={5.2} cy={7.8} r={2.2} stroke={color} {...stroke} />
      <Circle cx={18.8} cy={7.8} r={2.2} stroke={color} {...stroke} />
      <Path d="M1.8 15.5c.5-1.8 1.8-2.9 3.6-3M22.2 15.5c-.5-1.8-1.8-2.9-3.6-3" stroke={color} {...stroke} />
    </Svg>
  );
}

/** A folder holding a card: a client's record. */
export function RecordsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Path
        d="M3 7.5V18a2 2 0 0 0 2 2h14a2 2 0 0 0 2-2V9.5a2 2 0 0 0-2-2h-7L10 5H5a2 2 0 0 0-2 2.5z"
        stroke={color}
        {...stroke}
      />
      <Circle cx={9} cy={13} r={1.8} stroke={color} {...stroke} />
      <Line x1={13} y1={12.2} x2={17.5} y2={12.2} stroke={color} {...stroke} />
      <Line x1={13} y1={15.2} x2={16} y2={15.2} stroke={color} {...stroke} />
    </Svg>
  );
}

/** A card with its stripe. */
export function BillingIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Rect x={2.5} y={5} width={19} height={14} rx={2.5} stroke={color} {...stroke} />
      <Line x1={2.5} y1={9.5} x2={21.5} y2={9.5} stroke={color} {...stroke} />
      <Line x1={6} y1={15} x2={10} y2={15} stroke={color} {...stroke} />
    </Svg>
  );
}

/** A page of lines under a clock hand: who did what, and when. */
export function AuditIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Path d="M14 3.5H6.5a2 2 0 0 0-2 2v13a2 2 0 0 0 2 2H11" stroke={color} {...stroke} />
      <Line x1={8} y1={8} x2={14} y2={8} stroke={color} {...stroke} />
      <Line x1={8} y1={11.5} x2={12} y2={11.5} stroke={color} {...stroke} />
      <Circle cx={16.5} cy={16} r={4.5} stroke={color} {...stroke} />
      <Path d="M16.5 13.8V16l1.6 1.1" stroke={color} {...stroke} />
    </Svg>
  );
}

/** Three sliders at different settings. */
export function SettingsIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Line x1={4} y1={6} x2={20} y2={6} stroke={color} {...stroke} />
      <Line x1={4} y1={12} x2={20} y2={12} stroke={color} {...stroke} />
      <Line x1={4} y1={18} x2={20} y2={18} stroke={color} {...stroke} />
      <Circle cx={9} cy={6} r={2.2} fill={color} />
      <Circle cx={15.5} cy={12} r={2.2} fill={color} />
      <Circle cx={7} cy={18} r={2.2} fill={color} />
    </Svg>
  );
}

/** An envelope: delivered mail in the local mailbox. */
export function MailIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Rect x={2.5} y={5} width={19} height={14} rx={2.5} stroke={color} {...stroke} />
      <Path d="M3.5 6.5l8.5 6.5 8.5-6.5" stroke={color} {...stroke} />
    </Svg>
  );
}

/** Three dots: the rest of the sections, where the bar is full. */
export function MoreIcon({ color, size = 22 }: IconProps) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      <Circle cx={5} cy={12} r={1.6} fill={color} />
      <Circle cx={12} cy={12} r={1.6} fill={color} />
      <Circle cx={19} cy={12} r={1.6} fill={color} />
    </Svg>
  );
}
