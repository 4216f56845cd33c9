import { annotatedHeartRate, listRecordings, readSamples } from '@/scripts/analysis/circor';
import { describeWithOpenData } from '@/tests/support/open-data';
import { analysePcm } from './analyse';
import { preprocess } from './preprocess';
import type { AnalysisResult, SiteCode } from './types';
import { addCounts, emptyCounts, f1, scoreSounds, type AnnotatedSegment } from './scoring';

/*
 * Development data: CirCor DigiScope Phonocardiogram Dataset v1.0.3, training subset of 24 patients × 4 sites
 * (Oliveira et al., "The CirCor DigiScope Dataset: From Murmur Detection to Murmur Classification", IEEE JBHI 2022,
 * doi:10.1109/JBHI.2021.3137048; PhysioNet doi:10.13026/tshs-mw03). These checks use the committed model, which
 * was fitted on the same recordings: they are floors against regressions. The honest, cross-validated figures
 * come from scripts/analysis/score.ts. They need the whole open data folder (../shared/data/circor or
 * FOURPOINT_DATA_DIR) and skip, saying so in one line, without it.
 */

interface Case {
  id: string;
  site: SiteCode;
  murmur: string;
  segments: AnnotatedSegment[];
  result: AnalysisResult;
  /** Median RMS frequency of the detected S1 and S2 sounds, in Hz. */
  pitchHz: { S1: number | null; S2: number | null };
}

const middle = (values: number[]) =>
  values.length ? [...values].sort((a, b) => a - b)[values.length >> 1] : null;

/**
 * RMS frequency of each detected sound in the band-passed working signal, fs / 2π · sqrt(Σ(Δx)² / Σx²)
 * (the mean-square frequency of a signal is that of its derivative over its own), median per sound type;
 * the clip's first and last sound are left out as they may be cut by its edges.
 */
function pitches(samples: Float32Array, sampleRate: number, result: AnalysisResult): Case['pitchHz'] {
  const { signal, sampleRate: rate } = preprocess(samples, sampleRate);
  const byType: Record<'S1' | 'S2', number[]> = { S1: [], S2: [] };
  for (const sound of result.sounds.slice(1, -1)) {
    const from = Math.round(sound.startS * rate);
    const to = Math.min(signal.length, Math.round(sound.endS * rate));
    let power = 0;
    let slope = 0;
    for (let i = from + 1; i < to; i++) {
      power += signal[i] ** 2;
      slope += (signal[i] - signal[i - 1]) ** 2;
    }
    if (power > 0) byType[sound.type].push((rate / (2 * Math.PI)) * Math.sqrt(slope / power));
  }
  return { S1: middle(byType.S1), S2: middle(byType.S2) };
}

function sampleSd(values: number[]): number | null {
  if (values.length < 3) return null;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1));
}

const cases: Case[] = [];

function load(): Case[] {
  if (cases.length) return cases;
  for (const recording of listRecordings()) {
    const { samples, sampleRate } = readSamples(recording);
    const result = analysePcm(samples, sampleRate, { site: recording.site });
    cases.push({
      id: recording.id,
      site: recording.site,
      murmur: recording.murmur,
      segments: recording.segments,
      result,
      pitchHz: pitches(samples, sampleRate, result),
    });
  }
  return cases;
}

describeWithOpenData('CirCor development recordings', () => {
  beforeAll(load, 60000);

  // Scoring rule of Springer et al., "Logistic regression-HSMM-based heart sound segmentation", IEEE TBME 2016:
  // a detected S1/S2 is correct when its midpoint is within 100 ms of an annotated one of the same kind;
  // unannotated (label 0) stretches are skipped.
  test('when all 96 recordings are segmented, then S1/S2 F1 at 100 ms is at least 95 %', () => {
    let counts = emptyCounts();
    for (const c of load()) counts = addCounts(counts, scoreSounds(c.result.sounds, c.segments, 0.1));
    expect(f1(counts)).toBeGreaterThanOrEqual(0.95);
  });

  test('when all 96 recordings are analysed, then the heart rate is within 3 bpm of the annotation in at least 85 %', () => {
    const rated = load().filter((c) => annotatedHeartRate(c.segments) !== null);
    const within = rated.filter(
      (c) => Math.abs((c.result.heartRateBpm ?? -100) - (annotatedHeartRate(c.segments) ?? 0)) <= 3,
    );
    expect(within.length / rated.length).toBeGreaterThanOrEqual(0.85);
  });

  // Textbook physiology, from memory: S1 is louder than S2 at the apex (mitral) and lower left sternal border
  // (tricuspid), S2 louder at the base (aortic) — Bickley, Bates' Guide to Physical Examination and History
  // Taking. Checked on the recordings whose header says "#Murmur: Absent", with S1:S2 energy.
  const louderShare = (site: SiteCode) => {
    const normal = load().filter(
      (c) => c.site === site && c.murmur === 'Absent' && c.result.metrics.s1s2EnergyRatio !== null,
    );
    return {
      count: normal.length,
      s1Louder: normal.filter((c) => (c.result.metrics.s1s2EnergyRatio ?? 0) > 1).length,
    };
  };
  test('when normal recordings are taken at the mitral site, then S1 is louder than S2 in most', () => {
    const { count, s1Louder } = louderShare('mitral');
    expect(count).toBeGreaterThan(5);
    expect(s1Louder / count).toBeGreaterThan(0.5);
  });
  test('when normal recordings are taken at the tricuspid site, then S1 is louder than S2 in most', () => {
    const { count, s1Louder } = louderShare('tricuspid');
    expect(count).toBeGreaterThan(5);
    expect(s1Louder / count).toBeGreaterThan(0.5);
  });
  test('when normal recordings are taken at the aortic site, then S2 is louder than S1 in most', () => {
    const { count, s1Louder } = louderShare('aortic');
    expect(count).toBeGreaterThan(5);
    expect((count - s1Louder) / count).toBeGreaterThan(0.5);
  });

  // Which sound is S1 is the segmentation's hardest call when systole and diastole last about the same (fast
  // rates). Two textbook cues that do not depend on durations check the orientation we give the sounds:
  // S1 is lower-pitched than S2 (Bickley, Bates' Guide to Physical Examination and History Taking, from memory),
  // and a change in cycle length falls mostly on diastole, so the S1-to-S2 interval varies less from beat to
  // beat than the S2-to-S1 interval (Guyton & Hall, Textbook of Medical Physiology, from memory).
  test('when all 96 recordings are segmented, then the sounds labelled S2 are higher-pitched than those labelled S1 in at least 85 %', () => {
    const rated = load().filter((c) => c.pitchHz.S1 !== null && c.pitchHz.S2 !== null);
    const s2Higher = rated.filter((c) => (c.pitchHz.S2 ?? 0) > (c.pitchHz.S1 ?? 0));
    expect(rated.length).toBeGreaterThan(90);
    expect(s2Higher.length / rated.length).toBeGreaterThanOrEqual(0.85);
  });

  test('when all 96 recordings are segmented, then systole varies less from beat to beat than diastole in at least 85 %', () => {
    const spreads = load().map((c) => ({
      systole: sampleSd(c.result.metrics.beats.map((b) => b.systoleMs)),
      diastole: sampleSd(
        c.result.metrics.beats.map((b) => b.diastoleMs).filter((v): v is number => v !== null),
      ),
    }));
    const rated = spreads.filter((s) => s.systole !== null && s.diastole !== null);
    const steadier = rated.filter((s) => (s.systole ?? 0) < (s.diastole ?? 0));
    expect(rated.length).toBeGreaterThan(90);
    expect(steadier.length / rated.length).toBeGreaterThanOrEqual(0.85);
  });
});
