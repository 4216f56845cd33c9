// The parts of s3rver (it ships no types) that the local S3 fake uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  export default class S3rver {
    constructor(options: {
      address?: string;
      port?: number;
      directory: string;
      silent?: boolean;
      resetOnClose?: boolean;
      allowMismatchedSignatures?: boolean;
      configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
    });
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
