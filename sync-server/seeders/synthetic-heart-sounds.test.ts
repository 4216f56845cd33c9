import { synthesizeHeartSounds, seededRandom } from './synthetic-heart-sounds';

// These check the demo generator against what it was asked for; it is never the truth for analysis tests.
const peakNear = (samples: Float32Array, sampleRate: number, atS: number, spanS: number) => {
  let peak = 0;
  const from = Math.round(atS * sampleRate);
  for (let i = from; i < Math.min(samples.length, from + Math.round(spanS * sampleRate)); i++)
    peak = Math.max(peak, Math.abs(samples[i]));
  return peak;
};

describe('synthetic heart sounds (demo generator)', () => {
  test('when the same seed is used twice, then the clips are identical, and another seed differs', () => {
    const a = synthesizeHeartSounds({ seed: 7, site: 'mitral', bpm: 72 });
    const b = synthesizeHeartSounds({ seed: 7, site: 'mitral', bpm: 72 });
    const c = synthesizeHeartSounds({ seed: 8, site: 'mitral', bpm: 72 });
    expect(Buffer.from(a.samples.buffer).equals(Buffer.from(b.samples.buffer))).toBe(true);
    expect(Buffer.from(a.samples.buffer).equals(Buffer.from(c.samples.buffer))).toBe(false);
  });

  test('when asked for 15 s at 4000 Hz, then it gives 60000 samples that never clip', () => {
    const { samples, sampleRate } = synthesizeHeartSounds({ seed: 1, site: 'aortic', bpm: 72 });
    expect(sampleRate).toBe(4000);
    expect(samples.length).toBe(60000);
    expect(Math.max(...samples.map(Math.abs))).toBeLessThanOrEqual(0.6 + 1e-6);
  });

  test('when asked for 72 bpm, then the beats come at about that rate with a systole of about 0.3 s', () => {
    const { beats } = synthesizeHeartSounds({ seed: 3, site: 'tricuspid', bpm: 72 });
    const rr = beats.slice(1).map((b, i) => b.s1 - beats[i].s1);
    const meanRr = rr.reduce((s, x) => s + x, 0) / rr.length;
    expect(60 / meanRr).toBeGreaterThan(68);
    expect(60 / meanRr).toBeLessThan(76);
    const systole = beats.map((b) => b.s2 - b.s1).reduce((s, x) => s + x, 0) / beats.length;
    expect(systole).toBeGreaterThan(0.27);
    expect(systole).toBeLessThan(0.33);
    expect(new Set(rr.map((x) => x.toFixed(4))).size).toBeGreaterThan(1);
  });

  test('when the site is mitral, then S1 is louder than S2, and at the aortic site S2 is louder', () => {
    const ratio = (site: 'mitral' | 'aortic') => {
      const clip = synthesizeHeartSounds({ seed: 11, site, bpm: 70, noise: 0 });
      const s1 = clip.beats.map((b) => peakNear(clip.samples, clip.sampleRate, b.s1, 0.11));
      const s2 = clip.beats.map((b) => peakNear(clip.samples, clip.sampleRate, b.s2, 0.08));
      return s1.reduce((s, x) => s + x, 0) / s2.reduce((s, x) => s + x, 0);
    };
    expect(ratio('mitral')).toBeGreaterThan(1.2);
    expect(ratio('aortic')).toBeLessThan(0.85);
  });

  test('when the seeded random source runs, then it stays in [0, 1)', () => {
    const random = seededRandom(42);
    for (let i = 0; i < 1000; i++) {
      const x = random();
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
    }
  });
});
