// s3rver 3.7 ships no types; this covers what the tests and scripts/fakes.mjs use.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  interface S3rverOptions {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    vhostBuckets?: boolean;
    allowMismatchedSignatures?: boolean;
    resetOnClose?: boolean;
    configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
  }

  export default class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
    reset(): void;
  }
}
