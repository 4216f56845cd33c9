/**
 * Invented heart-sound-like test signals: S1 and S2 as decaying low-frequency tone bursts on a beat train of a
 * chosen rate. For tests and demo clips only; no recording of a person.
 */
export interface BeatTrainOptions {
  rateBpm: number;
  durationS: number;
  sampleRate: number;
  /** S1 onset to S2 onset; defaults to min(0.1 s + cycle/4, 0.48 cycle) (common practice, no source). */
  systoleS?: number;
  s1Amplitude?: number;
  s2Amplitude?: number;
  /** Standard deviation of added white noise. */
  noise?: number;
  /** Beat-to-beat interval jitter as a fraction of the cycle (uniform ±). */
  jitter?: number;
  seed?: number;
  /** The rate at the end of the clip, changing linearly from `rateBpm` (a drifting rate). */
  endRateBpm?: number;
  /** Chance that a beat's sounds are missing (a beat the chest piece did not pick up). */
  dropChance?: number;
  /** Chance that a premature beat (an S1 and S2 pair) falls at 60 % of a diastole. */
  extraBeatChance?: number;
  /**
   * A holosystolic murmur: noise band-limited to `lowHz`–`highHz` (default 120–300 Hz) filling each systole from
   * the end of S1 to the onset of S2 at a steady `amplitude` (RMS), with 10 ms ramps.
   */
  systolicMurmur?: { amplitude: number; lowHz?: number; highHz?: number };
}

/** Band-limited noise: a sum of sinusoids spread over the band with random phases, scaled to unit RMS. */
function bandNoise(length: number, sampleRate: number, lowHz: number, highHz: number, random: () => number) {
  const out = new Float32Array(length);
  const tones = 40;
  for (let k = 0; k < tones; k++) {
    const frequency = lowHz + ((highHz - lowHz) * (k + random())) / tones;
    const phase = 2 * Math.PI * random();
    const step = (2 * Math.PI * frequency) / sampleRate;
    for (let i = 0; i < length; i++) out[i] += Math.sin(phase + step * i);
  }
  const scale = Math.sqrt(2 / tones);
  for (let i = 0; i < length; i++) out[i] *= scale;
  return out;
}

function addMurmur(
  out: Float32Array,
  sampleRate: number,
  fromS: number,
  toS: number,
  noise: Float32Array,
  amplitude: number,
) {
  const start = Math.max(0, Math.round(fromS * sampleRate));
  const end = Math.min(out.length, Math.round(toS * sampleRate));
  const ramp = Math.round(0.01 * sampleRate);
  for (let i = start; i < end; i++) {
    const edge = Math.min(1, (i - start) / ramp, (end - i) / ramp);
    out[i] += amplitude * edge * noise[i];
  }
}

export function seededRandom(seed: number): () => number {
  let state = seed >>> 0 || 1;
  return () => {
    // xorshift32
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 4294967296;
  };
}

export function gaussianRandom(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(random() + 1e-12)) * Math.cos(2 * Math.PI * random());
}

function addBurst(
  out: Float32Array,
  sampleRate: number,
  onsetS: number,
  lengthS: number,
  frequencyHz: number,
  amplitude: number,
) {
  const start = Math.round(onsetS * sampleRate);
  const length = Math.round(lengthS * sampleRate);
  for (let i = 0; i < length && start + i < out.length; i++) {
    if (start + i < 0) continue;
    const t = i / sampleRate;
    const window = Math.sin((Math.PI * i) / length) ** 2;
    out[start + i] += amplitude * window * Math.sin(2 * Math.PI * frequencyHz * t);
  }
}

export interface BeatTrain {
  samples: Float32Array;
  s1OnsetsS: number[];
  s2OnsetsS: number[];
}

export function syntheticBeatTrain(options: BeatTrainOptions): BeatTrain {
  const { rateBpm, durationS, sampleRate } = options;
  const endRateBpm = options.endRateBpm ?? rateBpm;
  const rateAt = (t: number) => rateBpm + ((endRateBpm - rateBpm) * t) / durationS;
  const random = seededRandom(options.seed ?? 7);
  const gauss = gaussianRandom(random);
  const samples = new Float32Array(Math.round(durationS * sampleRate));
  const s1OnsetsS: number[] = [];
  const s2OnsetsS: number[] = [];
  const jitter = options.jitter ?? 0;
  // the murmur draws from its own generator so the beats of a seed stay the same with or without it
  const murmur = options.systolicMurmur;
  const murmurNoise = murmur
    ? bandNoise(
        samples.length,
        sampleRate,
        murmur.lowHz ?? 120,
        murmur.highHz ?? 300,
        seededRandom((options.seed ?? 7) + 1),
      )
    : null;
  for (let onset = 0.1 + (random() * 60) / rateBpm; onset < durationS;) {
    const cycleS = 60 / rateAt(onset);
    const systoleS = options.systoleS ?? Math.min(0.1 + cycleS / 4, 0.48 * cycleS);
    const s1Amplitude = options.s1Amplitude ?? 0.5;
    const s2Amplitude = options.s2Amplitude ?? 0.35;
    // Only draw from the generator for the options in use, so existing seeds give the same trains.
    const dropped = options.dropChance !== undefined && random() < options.dropChance;
    if (!dropped) {
      addBurst(samples, sampleRate, onset, 0.1, 55, s1Amplitude);
      addBurst(samples, sampleRate, onset + systoleS, 0.08, 80, s2Amplitude);
      if (murmur && murmurNoise)
        addMurmur(samples, sampleRate, onset + 0.1, onset + systoleS, murmurNoise, murmur.amplitude);
    }
    if (options.extraBeatChance !== undefined && random() < options.extraBeatChance) {
      const early = onset + systoleS + 0.6 * (cycleS - systoleS);
      const earlySystoleS = 0.8 * systoleS;
      if (early + earlySystoleS + 0.1 < onset + cycleS) {
        addBurst(samples, sampleRate, early, 0.1, 55, s1Amplitude);
        addBurst(samples, sampleRate, early + earlySystoleS, 0.08, 80, s2Amplitude);
      }
    }
    s1OnsetsS.push(onset);
    if (onset + systoleS < durationS) s2OnsetsS.push(onset + systoleS);
    onset += cycleS * (1 + jitter * (2 * random() - 1));
  }
  if (options.noise) for (let i = 0; i < samples.length; i++) samples[i] += options.noise * gauss();
  return { samples, s1OnsetsS, s2OnsetsS };
}
