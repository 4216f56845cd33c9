import Svg, { Circle, G, Line, Path, Text as SvgText } from 'react-native-svg';
import { colors, fonts } from '@/ui/theme';
import type { Site } from '@/shared/protocol';

// Our own front view of a torso; the client's right is the viewer's left. Positions follow the usual landmarks
// (common practice, no source): aortic and pulmonic in the 2nd intercostal space either side of the sternum,
// tricuspid at the lower left sternal edge, mitral at the apex in the 5th space at the mid-clavicular line.
const spots: Record<Site, { x: number; y: number; short: string }> = {
  aortic: { x: 88, y: 92, short: 'A' },
  pulmonic: { x: 112, y: 92, short: 'P' },
  tricuspid: { x: 110, y: 142, short: 'T' },
  mitral: { x: 138, y: 160, short: 'M' },
};

const ribs = [78, 96, 114, 132, 150, 168];

export function SitePicture({ site, size = 180 }: { site: Site; size?: number }) {
  return (
    <Svg
      width={size}
      height={size * 1.1}
      viewBox="0 0 200 220"
      testID={`site-picture-${site}`}
      accessibilityLabel={`Placement for the ${site} site`}
    >
      <Path
        d="M60 30 Q100 44 140 30 L172 52 Q182 120 168 206 L32 206 Q18 120 28 52 Z"
        fill={colors.surfaceMuted}
        stroke={colors.inkSoft}
        strokeWidth={2}
      />
      <Path d="M80 34 Q100 50 120 34" fill="none" stroke={colors.inkSoft} strokeWidth={1.5} />
      <Line
        x1={100}
        y1={58}
        x2={100}
        y2={150}
        stroke={colors.inkSoft}
        strokeWidth={6}
        strokeLinecap="round"
        opacity={0.35}
      />
      <G opacity={0.35}>
        {ribs.map((y) => (
          <G key={y}>
            <Path
              d={`M92 ${y} Q66 ${y - 6} 42 ${y + 10}`}
              fill="none"
              stroke={colors.inkSoft}
              strokeWidth={1.5}
            />
            <Path
              d={`M108 ${y} Q134 ${y - 6} 158 ${y + 10}`}
              fill="none"
              stroke={colors.inkSoft}
              strokeWidth={1.5}
            />
          </G>
        ))}
      </G>
      {(Object.keys(spots) as Site[]).map((key) => {
        const spot = spots[key];
        const active = key === site;
        return (
          <G key={key}>
            {active ? <Circle cx={spot.x} cy={spot.y} r={16} fill={colors.accent} opacity={0.22} /> : null}
            <Circle
              cx={spot.x}
              cy={spot.y}
              r={active ? 9 : 6}
              fill={active ? colors.accent : colors.surface}
              stroke={active ? colors.accent : colors.inkSoft}
              strokeWidth={1.5}
            />
            <SvgText
              x={spot.x}
              y={spot.y + (active ? 28 : 20)}
              fontSize={11}
              fontFamily={fonts.bodySemiBold}
              fontWeight="bold"
              fill={active ? colors.accent : colors.textMuted}
              textAnchor="middle"
            >
              {spot.short}
            </SvgText>
          </G>
        );
      })}
      <SvgText x={22} y={216} fontSize={9} fontFamily={fonts.body} fill={colors.textMuted}>
        client’s right
      </SvgText>
      <SvgText x={178} y={216} fontSize={9} fontFamily={fonts.body} fill={colors.textMuted} textAnchor="end">
        client’s left
      </SvgText>
    </Svg>
  );
}
