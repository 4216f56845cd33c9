/**
 * Sound-detection scoring after Springer et al., IEEE TBME 2016: a detected S1 or S2 is a true positive when its
 * midpoint lies within the tolerance of the midpoint of an annotated sound of the same kind (each annotated
 * sound matched once); detections inside unannotated stretches are not counted.
 */
export interface AnnotatedSegment {
  startS: number;
  endS: number;
  /** 0 not annotated, 1 S1, 2 systole, 3 S2, 4 diastole (CirCor convention). */
  label: number;
}

export interface DetectedSound {
  type: 'S1' | 'S2';
  startS: number;
  endS: number;
}

export interface Counts {
  truePositives: number;
  falsePositives: number;
  falseNegatives: number;
}

export function addCounts(a: Counts, b: Counts): Counts {
  return {
    truePositives: a.truePositives + b.truePositives,
    falsePositives: a.falsePositives + b.falsePositives,
    falseNegatives: a.falseNegatives + b.falseNegatives,
  };
}

export const emptyCounts = (): Counts => ({ truePositives: 0, falsePositives: 0, falseNegatives: 0 });

export function f1(c: Counts): number {
  const denominator = 2 * c.truePositives + c.falsePositives + c.falseNegatives;
  return denominator === 0 ? 1 : (2 * c.truePositives) / denominator;
}

export function sensitivity(c: Counts): number {
  return c.truePositives / Math.max(1, c.truePositives + c.falseNegatives);
}

export function positivePredictiveValue(c: Counts): number {
  return c.truePositives / Math.max(1, c.truePositives + c.falsePositives);
}

function isAnnotated(segments: AnnotatedSegment[], t: number): boolean {
  for (const s of segments) if (s.startS <= t && t < s.endS) return s.label !== 0;
  return false;
}

export function scoreSounds(
  detected: DetectedSound[],
  segments: AnnotatedSegment[],
  toleranceS: number,
): Counts {
  let counts = emptyCounts();
  for (const [type, label] of [
    ['S1', 1],
    ['S2', 3],
  ] as const) {
    const truth = segments.filter((s) => s.label === label).map((s) => (s.startS + s.endS) / 2);
    const used = new Uint8Array(truth.length);
    let tp = 0;
    let fp = 0;
    for (const sound of detected) {
      if (sound.type !== type) continue;
      const mid = (sound.startS + sound.endS) / 2;
      if (!isAnnotated(segments, mid)) continue;
      let best = -1;
      for (let i = 0; i < truth.length; i++) {
        if (
          !used[i] &&
          Math.abs(truth[i] - mid) <= toleranceS &&
          (best < 0 || Math.abs(truth[i] - mid) < Math.abs(truth[best] - mid))
        )
          best = i;
      }
      if (best >= 0) {
        used[best] = 1;
        tp++;
      } else fp++;
    }
    counts = addCounts(counts, { truePositives: tp, falsePositives: fp, falseNegatives: truth.length - tp });
  }
  return counts;
}
