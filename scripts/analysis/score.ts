/**
 * Patient-wise cross-validation on the CirCor DigiScope subset (Oliveira et al., IEEE JBHI 2022,
 * doi:10.1109/JBHI.2021.3137048): the model is fitted on the other patients' recordings and scored on the
 * held-out patient group with the rule of Springer et al., IEEE TBME 2016 (midpoint within 100 ms, and 60, 40 and
 * 20 ms). Both open folders together by default (174 patients); `--folder circor` scores the first alone.
 * Heart-rate truth as the dataset README defines it: 60 / median interval between annotated S1 onsets.
 * Run: npx tsx scripts/analysis/score.ts [--folds N] [--folder circor|both] [--verbose]
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
import { preprocess } from '../../shared/analysis/preprocess';
import { median } from '../../shared/analysis/variability';
import {
  annotatedHeartRate,
  dataDir,
  heldOutDataDir,
  listRecordings,
  readSamples,
  type Segment,
} from './circor';

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

/**
 * Why a rate misses the annotation by more than 3 bpm, worst kinds first: half or double the annotated rate (a
 * sound taken for a beat or a beat lost), the whole clip against the annotated stretch (our beats inside the
 * stretch agree: the rate changed over a clip the annotation covers only in part), within 6 bpm, or other.
 */
function missKind(ours: number | null, truth: number, inside: number | null): string {
  if (ours === null) return 'no rate';
  if (Math.abs(ours / truth - 0.5) < 0.06) return 'half';
  if (Math.abs(ours / truth - 2) < 0.2) return 'double';
  if (inside !== null && Math.abs(inside - truth) <= 3) return 'whole clip vs annotated stretch';
  if (Math.abs(ours - truth) <= 6) return 'off by 3-6 bpm';
  return 'other';
}

/** The stretch of a recording that the annotation covers (first to last labelled segment). */
function annotatedSpan(segments: Segment[]): [number, number] {
  const labelled = segments.filter((s) => s.label !== 0);
  return labelled.length ? [labelled[0].startS, labelled[labelled.length - 1].endS] : [0, 0];
}

/** RMS frequency of a stretch of the working signal: fs / 2π · sqrt(Σ(Δx)² / Σx²). */
function rmsFrequencyHz(signal: Float64Array, rate: number, startS: number, endS: number): number | null {
  let power = 0;
  let slope = 0;
  for (let i = Math.round(startS * rate) + 1; i < Math.min(signal.length, Math.round(endS * rate)); i++) {
    power += signal[i] ** 2;
    slope += (signal[i] - signal[i - 1]) ** 2;
  }
  return power > 0 ? (rate / (2 * Math.PI)) * Math.sqrt(slope / power) : null;
}

type Sound = { type: 'S1' | 'S2'; startS: number; endS: number };

/**
 * Textbook cue to which sound is S1, independent of durations: S2 is the higher-pitched (Bickley, Bates' Guide
 * to Physical Examination and History Taking, from memory). True when a labelling's S2 sounds have the higher
 * median RMS frequency.
 */
function s2HigherPitched(signal: Float64Array, rate: number, sounds: Sound[]): boolean | null {
  const pitch = (type: Sound['type']) =>
    median(
      sounds
        .filter((s) => s.type === type)
        .map((s) => rmsFrequencyHz(signal, rate, s.startS, s.endS))
        .filter((v): v is number => v !== null),
    );
  const s1 = pitch('S1');
  const s2 = pitch('S2');
  return s1 === null || s2 === null ? null : s2 > s1;
}

/** Annotated S1/S2 sounds whose neighbours are annotated too (not cut by an unannotated stretch). */
function annotatedSounds(segments: Segment[]): Sound[] {
  return segments
    .filter((s, i) => (s.label === 1 || s.label === 3) && segments[i - 1]?.label && segments[i + 1]?.label)
    .map((s) => ({ type: s.label === 1 ? 'S1' : 'S2', startS: s.startS, endS: s.endS }));
}

function main() {
  const foldArg = process.argv.indexOf('--folds');
  const folds = foldArg > 0 ? Number(process.argv[foldArg + 1]) : 6;
  const verbose = process.argv.includes('--verbose');
  const folderArg = process.argv.indexOf('--folder');
  const folder = folderArg > 0 ? process.argv[folderArg + 1] : 'both';
  const recordings =
    folder === 'circor'
      ? listRecordings(dataDir())
      : [...listRecordings(dataDir()), ...listRecordings(heldOutDataDir())];
  const prepared = recordings.map(prepare);
  const patients = [...new Set(recordings.map((r) => r.patient))].sort();
  let at100: Counts = emptyCounts();
  let at60: Counts = emptyCounts();
  let at40: Counts = emptyCounts();
  let at20: Counts = emptyCounts();
  let goodTotal = 0;
  let goodOff10 = 0;
  const perRecording: number[] = [];
  let rateTotal = 0;
  let rateWithin3 = 0;
  let insideWithin3 = 0;
  const verdicts: Record<string, number> = {};
  const rateMisses: { kind: string; off: number; verdict: string; line: string }[] = [];
  const cue = { ours: 0, annotation: 0, rated: 0, disagreeing: [] as string[] };
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
      at40 = addCounts(at40, scoreSounds(result.sounds, recording.segments, 0.04));
      at20 = addCounts(at20, scoreSounds(result.sounds, recording.segments, 0.02));
      perRecording.push(f1(counts100));
      verdicts[result.quality.verdict] = (verdicts[result.quality.verdict] ?? 0) + 1;
      const truth = annotatedHeartRate(recording.segments);
      const within =
        truth !== null && result.heartRateBpm !== null && Math.abs(result.heartRateBpm - truth) <= 3;
      if (truth !== null) {
        rateTotal++;
        if (within) rateWithin3++;
        if (result.quality.verdict === 'good') {
          goodTotal++;
          if (result.heartRateBpm === null || Math.abs(result.heartRateBpm - truth) > 10) goodOff10++;
        }
        const inside = rateInsideAnnotation(result, recording.segments);
        if (inside !== null && Math.abs(inside - truth) <= 3) insideWithin3++;
        if (!within) {
          const [from, to] = annotatedSpan(recording.segments);
          const kind = missKind(result.heartRateBpm, truth, inside);
          rateMisses.push({
            kind,
            off: Math.abs((result.heartRateBpm ?? Infinity) - truth),
            verdict: result.quality.verdict,
            line:
              `${recording.id} (${kind}, ${result.quality.verdict}): annotation ${truth.toFixed(1)} bpm over ${from.toFixed(1)}-${to.toFixed(1)} s of ` +
              `${(samples.length / sampleRate).toFixed(1)} s; ours ${result.heartRateBpm?.toFixed(1)} bpm ` +
              `(whole clip), ${inside?.toFixed(1)} bpm (our beats inside the annotated stretch)`,
          });
        }
      }
      if (verbose) {
        const working = preprocess(samples, sampleRate);
        const ours = s2HigherPitched(working.signal, working.sampleRate, result.sounds);
        const theirs = s2HigherPitched(
          working.signal,
          working.sampleRate,
          annotatedSounds(recording.segments),
        );
        if (ours !== null && theirs !== null) {
          cue.rated++;
          if (ours) cue.ours++;
          if (theirs) cue.annotation++;
          if (ours !== theirs) cue.disagreeing.push(`${recording.id} (ours ${ours}, annotation ${theirs})`);
        }
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
    `CirCor (${folder === 'circor' ? 'circor' : 'circor + circor-train'}): ${recordings.length} recordings, ${patients.length} patients, ${folds}-fold patient-wise cross-validation`,
  );
  console.log(line('S1+S2 at 100 ms', at100));
  console.log(line('S1+S2 at  60 ms', at60));
  console.log(line('S1+S2 at  40 ms', at40));
  console.log(line('S1+S2 at  20 ms', at20));
  console.log(
    `mean per-recording F1 at 100 ms: ${pct(perRecording.reduce((a, b) => a + b, 0) / perRecording.length)}`,
  );
  console.log(
    `heart rate within 3 bpm of annotation, whole clip: ${rateWithin3}/${rateTotal} (${pct(rateWithin3 / rateTotal)})`,
  );
  console.log(
    `heart rate within 3 bpm of annotation, beats inside the annotated stretch: ${insideWithin3}/${rateTotal} (${pct(insideWithin3 / rateTotal)})`,
  );
  console.log(
    `clips called good whose rate is more than 10 bpm off the annotation: ${goodOff10}/${goodTotal} (${pct(goodOff10 / goodTotal)})`,
  );
  console.log(`verdicts: ${JSON.stringify(verdicts)}`);
  const kinds = new Map<string, { all: number; good: number }>();
  for (const miss of rateMisses) {
    const count = kinds.get(miss.kind) ?? { all: 0, good: 0 };
    count.all++;
    if (miss.verdict === 'good') count.good++;
    kinds.set(miss.kind, count);
  }
  console.log(
    `heart-rate misses by kind (all, of them called good): ${[...kinds.entries()]
      .map(([kind, c]) => `${kind} ${c.all} (${c.good})`)
      .join(', ')}`,
  );
  const worst = [...rateMisses].sort((a, b) => b.off - a.off).slice(0, 15);
  console.log(`worst heart-rate misses:\n  ${worst.map((m) => m.line).join('\n  ')}`);
  if (verbose) {
    console.log(`heart-rate misses:\n  ${rateMisses.map((m) => m.line).join('\n  ')}`);
    console.log(
      `S2 higher-pitched than S1 (textbook cue): our labelling ${cue.ours}/${cue.rated}, the annotation's ` +
        `${cue.annotation}/${cue.rated}; they differ on: ${cue.disagreeing.join(', ') || 'none'}`,
    );
  }
}

main();
