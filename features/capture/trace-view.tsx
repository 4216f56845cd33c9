import { View } from 'react-native';
import Svg, { Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts } from '@/ui/theme';
import type { DisplayTrace } from '@/device/local-store/records';
import type { HeartSound } from '@/shared/analysis/types';

type Props = { trace: DisplayTrace; sounds: HeartSound[]; width: number; height?: number; testID?: string };

const labelGapPx = 18;

const labelRowY: Record<HeartSound['type'], number> = { S1: 10, S2: 21 };

/**
 * Labels where they fit: none on small traces (the shading carries it). S1 and S2 sit a few pixels apart on a
 * phone, so each kind has its own row, and within a row labels are thinned by space alone (never two closer than
 * labelGapPx): both kinds stay labelled at any width.
 */
export function labelled(sounds: HeartSound[], toX: (s: number) => number, height: number) {
  if (height < 100) return [];
  const out: { sound: HeartSound; x: number; y: number }[] = [];
  const last: Record<HeartSound['type'], number> = { S1: -Infinity, S2: -Infinity };
  for (const sound of sounds) {
    const x = toX((sound.startS + sound.endS) / 2);
    if (x - last[sound.type] < labelGapPx) continue;
    out.push({ sound, x, y: labelRowY[sound.type] });
    last[sound.type] = x;
  }
  return out;
}

/** The clip as a min/max band per column, with each detected S1 and S2 shaded and labelled. */
export function TraceView({ trace, sounds, width, height = 150, testID = 'trace' }: Props) {
  const columns = trace.min.length;
  const labelBand = height < 100 ? 4 : 25;
  const mid = labelBand + (height - labelBand) / 2;
  const peak = Math.max(1e-6, ...trace.max.map(Math.abs), ...trace.min.map(Math.abs));
  const half = (height - labelBand) / 2 - 2;
  const x = (i: number) => (columns <= 1 ? 0 : (i / (columns - 1)) * width);
  let d = '';
  for (let i = 0; i < columns; i++) {
    const top = mid - ((trace.max[i] ?? 0) / peak) * half;
    const bottom = mid - ((trace.min[i] ?? 0) / peak) * half;
    d += `M${x(i).toFixed(1)} ${top.toFixed(1)}L${x(i).toFixed(1)} ${Math.max(bottom, top + 0.5).toFixed(1)}`;
  }
  const toX = (s: number) => (trace.durationS > 0 ? (s / trace.durationS) * width : 0);
  const s1 = sounds.filter((s) => s.type === 'S1').length;
  const s2 = sounds.length - s1;
  return (
    <View testID={testID} accessibilityLabel={`Trace with ${s1} S1 and ${s2} S2 marked`}>
      <Svg width={width} height={height}>
        <Rect x={0} y={0} width={width} height={height} fill={colors.surface} />
        {sounds.map((sound, i) => {
          const left = toX(sound.startS);
          const w = Math.max(1.5, toX(sound.endS) - left);
          const tint = sound.type === 'S1' ? colors.accent : colors.pulse;
          return (
            <Rect
              key={`b${i}`}
              testID={`mark-${sound.type}`}
              x={left}
              y={labelBand}
              width={w}
              height={height - labelBand}
              fill={tint}
              opacity={0.16}
            />
          );
        })}
        <Line x1={0} y1={mid} x2={width} y2={mid} stroke={colors.line} strokeWidth={1} />
        <Path d={d} stroke={colors.ink} strokeWidth={1} />
        {labelled(sounds, toX, height).map(({ sound, x: at, y }, i) => {
          const tint = sound.type === 'S1' ? colors.accent : colors.pulse;
          return (
            <SvgText
              key={`l${i}`}
              testID={`label-${sound.type}`}
              x={at}
              y={y}
              fontSize={9}
              fontFamily={fonts.bodySemiBold}
              fontWeight="bold"
              fill={tint}
              textAnchor="middle"
            >
              {sound.type}
            </SvgText>
          );
        })}
      </Svg>
    </View>
  );
}
