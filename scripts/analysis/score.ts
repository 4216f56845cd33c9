/**
 * Patient-wise cross-validation on the CirCor DigiScope subset (Oliveira et al., IEEE JBHI 2022,
 * doi:10.1109/JBHI.2021.3137048): the model is fitted on the other patients' recordings and scored on the
 * held-out patient group with the rule of Springer et al., IEEE TBME 2016 (midpoint within 100 ms, and 60 ms).
 * Heart-rate truth as the dataset README defines it: 60 / median interval between annotated S1 onsets.
 * Run: npx tsx scripts/analysis/score.ts [--folds N]
 */
import { analysePcm } from '../../shared/analysis/analyse';
import {
  addCounts,
  emptyCounts,
  f1,
  positivePredictiveValue,
  scoreSounds,
  sensitivity,
  type Counts,
} from '../../shared/analysis/scoring';
import { median } from '../../shared/analysis/variability';
import { annotatedHeartRate, listRecordings, readSamples, type Segment } from './circor';

/** Our rate from the beats inside the annotated stretch only: the annotation often covers part of the clip. */
function rateInsideAnnotation(result: ReturnType<typeof analysePcm>, segments: Segment[]): number | null {
  const onsets = segments.filter((s) => s.label === 1).map((s) => s.startS);
  if (onsets.length < 2) return null;
  const from = onsets[0] - 0.1;
  const to = onsets[onsets.length - 1] + 0.1;
  const intervals = result.metrics.beats
    .filter((b) => b.intervalMs !== null && b.s1StartS >= from && (b.nextS1StartS ?? Infinity) <= to)
    .map((b) => b.intervalMs as number);
  const typical = median(intervals);
  return typical ? 60000 / typical : null;
}
import { fitModel, prepare } from './fit-lib';

function main() {
  const foldArg = process.argv.indexOf('--folds');
  const folds = foldArg > 0 ? Number(process.argv[foldArg + 1]) : 6;
  const verbose = process.argv.includes('--verbose');
  const recordings = listRecordings();
  const prepared = recordings.map(prepare);
  const patients = [...new Set(recordings.map((r) => r.patient))].sort();
  let at100: Counts = emptyCounts();
  let at60: Counts = emptyCounts();
  const perRecording: number[] = [];
  let rateTotal = 0;
  let rateWithin3 = 0;
  let insideWithin3 = 0;
  const verdicts: Record<string, number> = {};
  for (let fold = 0; fold < folds; fold++) {
    const held = new Set(patients.filter((_, i) => i % folds === fold));
    const model = fitModel(
      prepared.filter((p) => !held.has(p.recording.patient)),
      `cv-${fold}`,
    );
    for (const recording of recordings.filter((r) => held.has(r.patient))) {
      const { samples, sampleRate } = readSamples(recording);
      const result = analysePcm(samples, sampleRate, { site: recording.site, model });
      const counts100 = scoreSounds(result.sounds, recording.segments, 0.1);
      at100 = addCounts(at100, counts100);
      at60 = addCounts(at60, scoreSounds(result.sounds, recording.segments, 0.06));
      perRecording.push(f1(counts100));
      verdicts[result.quality.verdict] = (verdicts[result.quality.verdict] ?? 0) + 1;
      const truth = annotatedHeartRate(recording.segments);
      const within =
        truth !== null && result.heartRateBpm !== null && Math.abs(result.heartRateBpm - truth) <= 3;
      if (truth !== null) {
        rateTotal++;
        if (within) rateWithin3++;
        const inside = rateInsideAnnotation(result, recording.segments);
        if (inside !== null && Math.abs(inside - truth) <= 3) insideWithin3++;
      }
      if (verbose) {
        const m = result.quality.measures;
        console.log(
          [
            recording.id,
            `F1 ${f1(counts100).toFixed(3)}`,
            `HR ${result.heartRateBpm?.toFixed(1)} vs ${truth?.toFixed(1)}`,
            result.quality.verdict,
            result.quality.reasons.map((r) => r.code).join(','),
            `periodicity ${m?.periodicity?.toFixed(2)}`,
            `rest ${m?.restActivity?.toFixed(2)}`,
            `cycles ${result.metrics.usableCycles}`,
          ].join('  '),
        );
      }
    }
  }
  const pct = (x: number) => `${(100 * x).toFixed(2)} %`;
  const line = (label: string, c: Counts) =>
    `${label}: F1 ${pct(f1(c))}  sensitivity ${pct(sensitivity(c))}  PPV ${pct(positivePredictiveValue(c))}  (TP ${c.truePositives}, FP ${c.falsePositives}, FN ${c.falseNegatives})`;
  console.log(
    `CirCor subset: ${recordings.length} recordings, ${patients.length} patients, ${folds}-fold patient-wise cross-validation`,
  );
  console.log(line('S1+S2 at 100 ms', at100));
  console.log(line('S1+S2 at  60 ms', at60));
  console.log(
    `mean per-recording F1 at 100 ms: ${pct(perRecording.reduce((a, b) => a + b, 0) / perRecording.length)}`,
  );
  console.log(
    `heart rate within 3 bpm of annotation, whole clip: ${rateWithin3}/${rateTotal} (${pct(rateWithin3 / rateTotal)})`,
  );
  console.log(
    `heart rate within 3 bpm of annotation, beats inside the annotated stretch: ${insideWithin3}/${rateTotal} (${pct(insideWithin3 / rateTotal)})`,
  );
  console.log(`verdicts: ${JSON.stringify(verdicts)}`);
}

main();
