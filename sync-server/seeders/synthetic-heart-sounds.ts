// Demo clips only: a toy model of S1 and S2 that looks plausible on a trace. Never use it as test truth.
import type { Site } from '@/shared/protocol';

export interface SyntheticClipOptions {
  seed: number;
  site: Site;
  bpm: number;
  sampleRate?: number;
  durationS?: number;
  /** Beat-to-beat spread of the RR interval, as a fraction of it. */
  jitter?: number;
  /** Gaussian noise level relative to the loudest sound. */
  noise?: number;
  /** Multiplies the site's S1:S2 loudness ratio, to let a client drift between visits. */
  s1s2Scale?: number;
  /** Low-level hum between S1 and S2, relative to S1. */
  systolicHum?: number;
}

export interface SyntheticClip {
  samples: Float32Array;
  sampleRate: number;
  /** Onsets in seconds of each generated S1 and its S2. */
  beats: { s1: number; s2: number }[];
}

// S1 is usually louder at the apex (mitral, tricuspid) and S2 at the base (aortic, pulmonic): common practice, no source.
const SITE_S1_S2_RATIO: Record<Site, number> = { mitral: 1.7, tricuspid: 1.4, aortic: 0.65, pulmonic: 0.8 };

/** mulberry32: a small, well-known 32-bit seeded generator. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

/** A damped tone burst of two components, added into `out` at `startS`. */
function addBurst(
  out: Float64Array,
  sampleRate: number,
  startS: number,
  durationS: number,
  freqsHz: [number, number],
  amplitude: number,
  phase: number,
): void {
  const start = Math.round(startS * sampleRate);
  const n = Math.round(durationS * sampleRate);
  for (let i = 0; i < n && start + i < out.length; i++) {
    const x = i / n;
    const envelope = Math.sin(Math.PI * x) ** 2 * Math.exp(-3 * x);
    const t = i / sampleRate;
    const tone =
      0.65 * Math.sin(2 * Math.PI * freqsHz[0] * t + phase) +
      0.35 * Math.sin(2 * Math.PI * freqsHz[1] * t + 2 * phase);
    out[start + i] += amplitude * envelope * tone;
  }
}

export function synthesizeHeartSounds(options: SyntheticClipOptions): SyntheticClip {
  const sampleRate = options.sampleRate ?? 4000;
  const durationS = options.durationS ?? 15;
  const jitter = options.jitter ?? 0.03;
  const noise = options.noise ?? 0.02;
  const ratio = SITE_S1_S2_RATIO[options.site] * (options.s1s2Scale ?? 1);
  const random = seededRandom(options.seed);
  const normal = gaussian(random);
  const out = new Float64Array(Math.round(sampleRate * durationS));
  const meanRr = 60 / options.bpm;
  // Systole shortens as the rate rises; about 0.3 s at 72 bpm (common practice, no source).
  const systoleS = 0.3 * Math.sqrt(meanRr / (60 / 72));
  const s1Amp = ratio >= 1 ? 1 : ratio;
  const s2Amp = ratio >= 1 ? 1 / ratio : 1;

  const beats: SyntheticClip['beats'] = [];
  let t = 0.15 + random() * meanRr * 0.5;
  while (t + systoleS + 0.1 < durationS) {
    const s2 = t + systoleS * (1 + 0.02 * normal());
    beats.push({ s1: t, s2 });
    addBurst(
      out,
      sampleRate,
      t,
      0.11,
      [45 + 10 * random(), 110 + 20 * random()],
      s1Amp * (1 + 0.05 * normal()),
      random() * Math.PI,
    );
    addBurst(
      out,
      sampleRate,
      s2,
      0.08,
      [70 + 15 * random(), 140 + 20 * random()],
      s2Amp * (1 + 0.05 * normal()),
      random() * Math.PI,
    );
    if (options.systolicHum) {
      const from = Math.round((t + 0.11) * sampleRate);
      const to = Math.min(out.length, Math.round(s2 * sampleRate));
      for (let i = from; i < to; i++) out[i] += options.systolicHum * s1Amp * normal() * 0.5;
    }
    t += meanRr * (1 + jitter * normal());
  }

  let peak = 0;
  for (let i = 0; i < out.length; i++) {
    // A slow breathing-like wander plus a little noise.
    out[i] += 0.03 * Math.sin((2 * Math.PI * 0.25 * i) / sampleRate) + noise * normal();
    peak = Math.max(peak, Math.abs(out[i]));
  }
  const samples = new Float32Array(out.length);
  const gain = peak > 0 ? 0.6 / peak : 0;
  for (let i = 0; i < out.length; i++) samples[i] = out[i] * gain;
  return { samples, sampleRate, beats };
}
