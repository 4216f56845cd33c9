import type { AnalysisErrorCode } from '@/shared/analysis/errors';

/**
 * Why an imported file could not be read, in the operator's words. The decoder's own message (chunk sizes,
 * "RIFF/WAVE") stays in the error for the logs; the screen shows this.
 */
export const importRefusalWords: Record<AnalysisErrorCode, string> = {
  empty: 'it holds no sound.',
  truncated: 'the file is cut short or damaged.',
  not_wav: 'it is not a WAV sound file.',
  unsupported_encoding: 'its sound is stored in a form Fourpoint cannot read; export it again as plain WAV.',
  bad_sample_rate: 'it was recorded at a quality setting Fourpoint cannot measure.',
  bad_samples: 'part of the sound is damaged.',
  too_long: 'it is longer than a recording at one site can be.',
  bad_channels: 'its sound channels are laid out in a way Fourpoint cannot read.',
};
