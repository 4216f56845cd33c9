import { useState } from 'react';
import { View, type LayoutChangeEvent } from 'react-native';
import Svg, { Circle, Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts } from '@/ui/theme';
import type { TrendSeries } from '@/shared/protocol/review';
import { formatDate } from '@/ui/format';
import { formatValue } from './measurements-table';
import { axisLabelAnchor, axisLabelIndices } from './trend-axis';

const dateFontSize = 9;

/** One measurement at one site across visits; the shaded band is the clinic's reference range. */
export function TrendChart({ series, testID }: { series: TrendSeries; testID: string }) {
  const [width, setWidth] = useState(0);
  const height = 120;
  const pad = { l: 40, r: 12, t: 8, b: 20 };
  const values = series.points.map((p) => p.value).filter((v): v is number => v !== null);
  const bounds = [...values, series.range?.low ?? NaN, series.range?.high ?? NaN].filter((v) =>
    Number.isFinite(v),
  );
  let lo = Math.min(...bounds);
  let hi = Math.max(...bounds);
  if (!Number.isFinite(lo)) {
    lo = 0;
    hi = 1;
  }
  if (hi - lo < 1e-9) {
    lo -= 1;
    hi += 1;
  }
  const margin = (hi - lo) * 0.1;
  lo -= margin;
  hi += margin;
  const n = series.points.length;
  const x = (i: number) =>
    pad.l + (n <= 1 ? (width - pad.l - pad.r) / 2 : (i / (n - 1)) * (width - pad.l - pad.r));
  const y = (v: number) => pad.t + (1 - (v - lo) / (hi - lo)) * (height - pad.t - pad.b);
  let d = '';
  series.points.forEach((p, i) => {
    if (p.value === null) return;
    d += `${d ? 'L' : 'M'}${x(i).toFixed(1)},${y(p.value).toFixed(1)}`;
  });
  // Whole dates, as many as fit without touching; a monospace digit is about 0.6 of the font size wide.
  const dates = series.points.map((p) => formatDate(p.startedAt));
  const dateWidth = Math.max(0, ...dates.map((d) => d.length)) * dateFontSize * 0.62;
  const dated =
    width > 0
      ? axisLabelIndices(
          series.points.map((_, i) => x(i)),
          dateWidth,
        )
      : [];
  const band =
    series.range && (series.range.low !== null || series.range.high !== null) ? series.range : null;
  return (
    <View
      onLayout={(e: LayoutChangeEvent) => setWidth(Math.round(e.nativeEvent.layout.width))}
      style={{ height }}
      testID={testID}
    >
      {width > 0 ? (
        <Svg width={width} height={height}>
          {band ? (
            <Rect
              x={pad.l}
              width={width - pad.l - pad.r}
              y={y(Math.min(hi, band.high ?? hi))}
              height={Math.max(0, y(Math.max(lo, band.low ?? lo)) - y(Math.min(hi, band.high ?? hi)))}
              fill={colors.pulseSoft}
              testID={`${testID}-band`}
            />
          ) : null}
          <Line x1={pad.l} y1={pad.t} x2={pad.l} y2={height - pad.b} stroke={colors.line} />
          <SvgText
            x={pad.l - 4}
            y={y(hi - margin) + 4}
            fontSize={9}
            textAnchor="end"
            fill={colors.textMuted}
            fontFamily={fonts.mono}
          >
            {formatValue(hi - margin)}
          </SvgText>
          <SvgText
            x={pad.l - 4}
            y={y(lo + margin) + 4}
            fontSize={9}
            textAnchor="end"
            fill={colors.textMuted}
            fontFamily={fonts.mono}
          >
            {formatValue(lo + margin)}
          </SvgText>
          <Path d={d} stroke={colors.ink} strokeWidth={2} fill="none" />
          {series.points.map((p, i) =>
            p.value === null ? null : (
              <Circle
                key={p.sessionId}
                cx={x(i)}
                cy={y(p.value)}
                r={4}
                fill={p.status === 'above' || p.status === 'below' ? colors.danger : colors.ink}
              />
            ),
          )}
          {dated.map((i) => (
            <SvgText
              key={`d-${series.points[i].sessionId}`}
              x={x(i)}
              y={height - 6}
              fontSize={dateFontSize}
              textAnchor={axisLabelAnchor(i, n)}
              fill={colors.textMuted}
              fontFamily={fonts.mono}
              testID={`${testID}-date`}
            >
              {formatDate(series.points[i].startedAt)}
            </SvgText>
          ))}
        </Svg>
      ) : null}
    </View>
  );
}
