export type SealErrorCode = 'not_sealed' | 'unsupported_version' | 'truncated' | 'bad_key' | 'cannot_open';

export class SealError extends Error {
  readonly code: SealErrorCode;

  constructor(code: SealErrorCode, message: string) {
    super(message);
    this.name = 'SealError';
    this.code = code;
  }
}
