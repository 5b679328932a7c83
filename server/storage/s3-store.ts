// Photos in S3-compatible object storage (Amazon S3, MinIO, Ceph, a hosting provider's store, or
// the local fake that `npm start` and `npm test` run). Every instance of the app reads and writes
// the same bucket, which stays private: photos reach people only through the app's own route,
// after the same access check as any session data (routes/photos.ts). The SDK is loaded on first
// use, so an instance that has not touched a photo yet starts without it.
import type { Readable } from 'node:stream';
import type { S3Client } from '@aws-sdk/client-s3';
import type { PhotoStore } from './photo-store';

export interface S3Settings {
  bucket: string;
  /** Empty for Amazon S3 itself; the service's URL for any other (e.g. http://127.0.0.1:4568). */
  endpoint?: string;
  region: string;
  /** Path-style URLs (endpoint/bucket/key), which most S3-compatible services and fakes need. */
  forcePathStyle: boolean;
  /** Unset: the SDK's own chain (environment, instance role, shared config). */
  accessKeyId?: string;
  secretAccessKey?: string;
}

/** S3 settings from the environment, or null when S3_BUCKET is not set (photos on disk then). */
export function s3SettingsFrom(env: NodeJS.ProcessEnv): S3Settings | null {
  if (!env.S3_BUCKET) return null;
  return {
    bucket: env.S3_BUCKET,
    endpoint: env.S3_ENDPOINT || undefined,
    region: env.S3_REGION || 'us-east-1',
    forcePathStyle: (env.S3_FORCE_PATH_STYLE ?? (env.S3_ENDPOINT ? 'true' : 'false')) === 'true',
    accessKeyId: env.S3_ACCESS_KEY_ID || undefined,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY || undefined,
  };
}

export function s3Store(settings: S3Settings): PhotoStore {
  let sdk: Promise<{ client: S3Client; s3: typeof import('@aws-sdk/client-s3') }> | undefined;
  // The SDK warns on Node 20 that its releases from 2027 on need Node 22: the version pinned in
  // package.json runs on Node 20; moving to Node 22 comes before updating it (see README).
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
  const load = () =>
    (sdk ??= import('@aws-sdk/client-s3').then((s3) => ({
      s3,
      client: new s3.S3Client({
        region: settings.region,
        endpoint: settings.endpoint,
        forcePathStyle: settings.forcePathStyle,
        credentials:
          settings.accessKeyId && settings.secretAccessKey ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } : undefined,
        // Photos are written once and read whole: a short wait for a busy service, then an error
        // (the phone keeps the photo and sends it again).
        maxAttempts: 3,
      }),
    })));
  const Bucket = settings.bucket;
  const notFound = (err: unknown) => {
    const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
    return e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404;
  };
  return {
    where: `s3://${Bucket}${settings.endpoint ? ` at ${settings.endpoint}` : ''}`,
    async put(name, data) {
      const { client, s3 } = await load();
      await client.send(new s3.PutObjectCommand({ Bucket, Key: name, Body: data, ContentType: 'image/jpeg', ContentLength: data.length }));
    },
    async get(name) {
      const { client, s3 } = await load();
      try {
        const out = await client.send(new s3.GetObjectCommand({ Bucket, Key: name }));
        return { body: out.Body as Readable, bytes: Number(out.ContentLength ?? 0) };
      } catch (err) {
        if (notFound(err)) return null;
        throw err;
      }
    },
    async remove(names) {
      if (!names.length) return;
      const { client, s3 } = await load();
      // One by one: some S3-compatible services lack the batch delete, and a photo has two files.
      await Promise.all(names.map((Key) => client.send(new s3.DeleteObjectCommand({ Bucket, Key }))));
    },
    async list() {
      const { client, s3 } = await load();
      // The original listing call: every S3-compatible service (and the local fake) signs it alike.
      const names: string[] = [];
      let Marker: string | undefined;
      do {
        const page = await client.send(new s3.ListObjectsCommand({ Bucket, Marker }));
        for (const o of page.Contents ?? []) if (o.Key) names.push(o.Key);
        Marker = page.IsTruncated ? names[names.length - 1] : undefined;
      } while (Marker);
      return names;
    },
    async check() {
      const { client, s3 } = await load();
      await client.send(new s3.HeadBucketCommand({ Bucket }));
    },
  };
}
