import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import Svg, { Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts } from '@/ui/theme';
import type { Trace } from '@/shared/protocol/review';
import type { TimeWindow } from './time-window';

type Props = {
  trace: Trace;
  window: TimeWindow;
  height?: number;
  cursorS?: number | null;
  /** An earlier visit drawn over this one, moved by `shiftS` so its first S1 meets today's. */
  overlay?: { trace: Trace; shiftS: number } | null;
  testID: string;
};

function areaPath(trace: Trace, window: TimeWindow, width: number, height: number, shiftS = 0): string {
  const span = window.end - window.start;
  const first = Math.max(0, Math.floor((window.start - shiftS) * trace.bucketsPerSecond));
  const last = Math.min(trace.max.length - 1, Math.ceil((window.end - shiftS) * trace.bucketsPerSecond));
  if (last <= first) return '';
  const x = (i: number) => (((i / trace.bucketsPerSecond + shiftS - window.start) / span) * width).toFixed(1);
  const y = (v: number) => (height / 2 - (v * height) / 2.2).toFixed(1);
  const step = Math.max(1, Math.floor((last - first) / (width * 1.5)));
  let top = '';
  let bottom = '';
  for (let i = first; i <= last; i += step) {
    let hi = trace.max[i];
    let lo = trace.min[i];
    for (let j = i + 1; j < Math.min(i + step, last + 1); j++) {
      hi = Math.max(hi, trace.max[j]);
      lo = Math.min(lo, trace.min[j]);
    }
    top += `${top ? 'L' : 'M'}${x(i)},${y(hi)}`;
    bottom = `L${x(i)},${y(lo)}` + bottom;
  }
  return `${top}${bottom}Z`;
}

/** A phonocardiogram trace with S1 and S2 shaded and labelled; a cursor marks the playback position. */
export function TraceView({ trace, window, height = 150, cursorS = null, overlay = null, testID }: Props) {
  const [width, setWidth] = useState(0);
  const onLayout = (e: LayoutChangeEvent) => setWidth(Math.round(e.nativeEvent.layout.width));
  const span = window.end - window.start;
  const tx = (t: number) => ((t - window.start) / span) * width;
  const ticks: number[] = [];
  const tickStep = span > 6 ? 1 : span > 2 ? 0.5 : 0.1;
  for (let t = Math.ceil(window.start / tickStep) * tickStep; t <= window.end; t += tickStep)
    ticks.push(Math.round(t * 10) / 10);
  const visibleSounds = trace.sounds.filter((s) => s.endS >= window.start && s.startS <= window.end);
  // Letters only where there is room for them; the shading still marks every sound.
  const labelled = width > 0 && (visibleSounds.length * 18) / width < 1;
  return (
    <View
      onLayout={onLayout}
      style={{ height: height + 16 }}
      testID={testID}
      accessibilityLabel={`Trace, ${visibleSounds.length} heart sounds marked`}
    >
      {width > 0 ? (
        <Svg width={width} height={height + 16}>
          <Rect x={0} y={0} width={width} height={height} fill={colors.surface} />
          {visibleSounds.map((s, i) => (
            <Rect
              key={`${s.type}-${i}`}
              x={tx(s.startS)}
              y={0}
              width={Math.max(1, tx(s.endS) - tx(s.startS))}
              height={height}
              fill={s.type === 'S1' ? colors.accent : colors.pulse}
              opacity={0.14}
            />
          ))}
          <Line x1={0} y1={height / 2} x2={width} y2={height / 2} stroke={colors.line} strokeWidth={1} />
          <Path d={areaPath(trace, window, width, height)} fill={colors.ink} />
          {overlay ? (
            <Path
              d={areaPath(overlay.trace, window, width, height, overlay.shiftS)}
              fill={colors.focus}
              opacity={0.6}
              testID={`${testID}-overlay`}
            />
          ) : null}
          {(labelled ? visibleSounds : []).map((s, i) => (
            <SvgText
              key={`l-${s.type}-${i}`}
              x={tx(s.startS) + 2}
              y={11}
              fontSize={10}
              fontFamily={fonts.bodySemiBold}
              fill={s.type === 'S1' ? colors.accent : colors.pulse}
              testID={`${testID}-${s.type}`}
            >
              {s.type}
            </SvgText>
          ))}
          {ticks.map((t) => (
            <SvgText
              key={t}
              x={tx(t)}
              y={height + 12}
              fontSize={9}
              fill={colors.textMuted}
              textAnchor={tx(t) < 12 ? 'start' : tx(t) > width - 12 ? 'end' : 'middle'}
              fontFamily={fonts.mono}
            >
              {`${t}s`}
            </SvgText>
          ))}
          {cursorS !== null && cursorS >= window.start && cursorS <= window.end ? (
            <Line
              x1={tx(cursorS)}
              y1={0}
              x2={tx(cursorS)}
              y2={height}
              stroke={colors.accent}
              strokeWidth={2}
              testID={`${testID}-cursor`}
            />
          ) : null}
        </Svg>
      ) : null}
    </View>
  );
}
