import type { AnalyseClip } from './demo';

// The shared analysis has no entry point (shared/analysis/index.ts) yet; until it does, demo clips carry no analysis.
export const analyseDemoClip: AnalyseClip | undefined = undefined;
