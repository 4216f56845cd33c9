import { analysePcm, type AnalysisResult } from '../analysis';
import { syntheticBeatTrain } from '../analysis/synthetic';
import { analysisResultSchema, storedAnalysisSchema, type AnalysisResultMessage } from './analysis';

// Type-level agreement: each side must be assignable to the other, so a field added to, dropped from or retyped in
// either shared/analysis/types.ts or the schema fails the typecheck (and ts-jest) until the other follows.
type Exactly<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const schemaMatchesTypes: Exactly<AnalysisResultMessage, AnalysisResult> = true;

describe('the analysis result schema', () => {
  it('agrees with the analysis types', () => {
    expect(schemaMatchesTypes).toBe(true);
  });

  it('accepts what the analysis returns, unchanged after a JSON round trip (as stored in jsonb)', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 72, durationS: 12, sampleRate: 4000, noise: 0.005 });
    const result = analysePcm(samples, 4000);
    const stored = JSON.parse(JSON.stringify(result)) as unknown;
    expect(analysisResultSchema.parse(stored)).toEqual(stored);
  });

  it('reads a result stored before the murmur screen existed, and refuses one that is not an analysis', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 72, durationS: 12, sampleRate: 4000, noise: 0.005 });
    const { screen: _screen, ...older } = JSON.parse(
      JSON.stringify(analysePcm(samples, 4000)),
    ) as AnalysisResult;
    expect(storedAnalysisSchema.safeParse(older).success).toBe(true);
    expect(storedAnalysisSchema.safeParse({ heartRateBpm: 'fast' }).success).toBe(false);
  });
});
