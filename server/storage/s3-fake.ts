// A local S3-compatible service for development and tests (an npm package, s3rver, files under a
// folder of .data/), started on loopback by `npm start` and `npm test` the way the SMTP sink is.
// Like a real bucket with no public access, it refuses every request that is not signed with its
// key: a browser, or anyone who learns an object's name, gets 403 from it; only the app reads it.
// (The fake checks the key id but not the signature's arithmetic: it computes bucket listings'
// signatures without the trailing slash the SDK signs, so it is told to accept mismatches.)
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import S3rver from '@20minutes/s3rver';

/** The fake's fixed keys (its own defaults): they open nothing but this loopback fake. */
export const S3_FAKE_KEYS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

export interface S3Fake {
  endpoint: string;
  bucket: string;
  /** The app's settings for this fake (S3_ENDPOINT, S3_BUCKET, keys, path-style URLs). */
  env: Record<string, string>;
  close(): Promise<void>;
}

export async function startS3Fake(opts: { dir: string; bucket: string; port?: number; host?: string }): Promise<S3Fake> {
  const host = opts.host ?? '127.0.0.1';
  const fake = new S3rver({
    directory: opts.dir,
    silent: true,
    vhostBuckets: false,
    allowMismatchedSignatures: true,
    configureBuckets: [{ name: opts.bucket }],
  });
  await fake.configureBuckets();
  const handle = fake.callback();
  const server = http.createServer((req, res) => {
    const signed = 'authorization' in req.headers || /[?&]X-Amz-Algorithm=/i.test(req.url ?? '');
    if (!signed) {
      res.writeHead(403, { 'Content-Type': 'application/xml' });
      res.end('<?xml version="1.0" encoding="UTF-8"?>\n<Error><Code>AccessDenied</Code><Message>Access Denied</Message></Error>');
      return;
    }
    handle(req, res);
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, host, () => resolve());
  });
  const endpoint = `http://${host}:${(server.address() as AddressInfo).port}`;
  return {
    endpoint,
    bucket: opts.bucket,
    env: {
      S3_ENDPOINT: endpoint,
      S3_BUCKET: opts.bucket,
      S3_REGION: 'us-east-1',
      S3_FORCE_PATH_STYLE: 'true',
      S3_ACCESS_KEY_ID: S3_FAKE_KEYS.accessKeyId,
      S3_SECRET_ACCESS_KEY: S3_FAKE_KEYS.secretAccessKey,
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
