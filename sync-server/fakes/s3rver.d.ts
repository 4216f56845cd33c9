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

// s3rver's registry of accepted key pairs; the fake replaces the published pair with one made per start.
declare module 's3rver/lib/models/account' {
  export default class AWSAccount {
    static DUMMY_ACCOUNT: AWSAccount;
    createKeyPair(accessKeyId: string, secretAccessKey: string): void;
    revokeAccessKey(accessKeyId: string): void;
  }
}
