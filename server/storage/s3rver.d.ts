// The parts of the S3 fake's API that s3-fake.ts uses (the package ships no types).
declare module '@20minutes/s3rver' {
  import type { IncomingMessage, ServerResponse } from 'node:http';

  interface S3rverOptions {
    directory: string;
    silent?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: { name: string; configs?: string[] }[];
  }

  export default class S3rver {
    constructor(options: S3rverOptions);
    configureBuckets(): Promise<void>;
    callback(): (req: IncomingMessage, res: ServerResponse) => void;
  }
}
