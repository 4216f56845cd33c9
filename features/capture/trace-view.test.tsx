import type { HeartSound } from '@/shared/analysis/types';
import { labelled } from './trace-view';

// A 15 s take at 66 bpm on a 360-pixel phone trace: 24 px per second, S2 about 0.33 s (8 px) after its S1.
// Systole of roughly a third of the cycle at rest: Guyton and Hall, Textbook of Medical Physiology, ch. 9.
function cycles(count: number, periodS = 60 / 66, systoleS = 0.33): HeartSound[] {
  const out: HeartSound[] = [];
  for (let i = 0; i < count; i++) {
    const s1 = 0.2 + i * periodS;
    out.push({ type: 'S1', startS: s1, endS: s1 + 0.1, peakAmplitude: 1 });
    out.push({ type: 'S2', startS: s1 + systoleS, endS: s1 + systoleS + 0.08, peakAmplitude: 0.7 });
  }
  return out;
}

const toX = (s: number) => (s / 15) * 360;

test('when S1 and S2 sit a few pixels apart on a phone, then both kinds are labelled, each on its own row', () => {
  const labels = labelled(cycles(16), toX, 150);
  const s1 = labels.filter((l) => l.sound.type === 'S1');
  const s2 = labels.filter((l) => l.sound.type === 'S2');
  expect(s1.length).toBeGreaterThan(10);
  expect(s2.length).toBe(s1.length);
  expect(new Set(s1.map((l) => l.y)).size).toBe(1);
  expect(s2[0]!.y).not.toBe(s1[0]!.y);
});

test('when beats are closer than a label, then labels of a row are thinned by space, never two closer than 18 px', () => {
  const labels = labelled(cycles(60, 0.25, 0.1), toX, 150);
  for (const type of ['S1', 'S2'] as const) {
    const xs = labels.filter((l) => l.sound.type === type).map((l) => l.x);
    expect(xs.length).toBeGreaterThan(5);
    for (let i = 1; i < xs.length; i++) expect(xs[i]! - xs[i - 1]!).toBeGreaterThanOrEqual(18);
  }
});

test('when the trace is small, then the shading carries the marks and no label is drawn', () => {
  expect(labelled(cycles(4), toX, 80)).toEqual([]);
});
