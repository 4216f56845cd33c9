export type AxisAnchor = 'start' | 'middle' | 'end';

/** The first date starts at its point and the last ends at its point, so neither is cut at the chart's edge. */
export function axisLabelAnchor(index: number, count: number): AxisAnchor {
  if (count > 1 && index === 0) return 'start';
  if (count > 1 && index === count - 1) return 'end';
  return 'middle';
}

function extent(x: number, anchor: AxisAnchor, width: number): [number, number] {
  if (anchor === 'start') return [x, x + width];
  if (anchor === 'end') return [x - width, x];
  return [x - width / 2, x + width / 2];
}

/**
 * Which visits get a whole date under a trend chart: the last always (the newest visit), the first when it fits,
 * and between them each one that does not touch its neighbours. `xs` are the points' positions, `labelWidth` the
 * width one date needs, `gap` the space kept between two dates.
 */
export function axisLabelIndices(xs: readonly number[], labelWidth: number, gap = 8): number[] {
  const n = xs.length;
  if (n === 0) return [];
  const span = (i: number) => extent(xs[i], axisLabelAnchor(i, n), labelWidth);
  const last = span(n - 1);
  const kept: number[] = [];
  let right = -Infinity;
  for (let i = 0; i < n - 1; i++) {
    const [l, r] = span(i);
    if (l >= right + gap && r + gap <= last[0]) {
      kept.push(i);
      right = r;
    }
  }
  return [...kept, n - 1];
}
