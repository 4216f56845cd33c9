export type AnalysisErrorCode =
  | 'empty'
  | 'truncated'
  | 'not_wav'
  | 'unsupported_encoding'
  | 'bad_sample_rate'
  | 'bad_samples'
  | 'too_long'
  | 'bad_channels';

export class AnalysisError extends Error {
  readonly code: AnalysisErrorCode;

  constructor(code: AnalysisErrorCode, message: string) {
    super(message);
    this.name = 'AnalysisError';
    this.code = code;
  }
}
