// Settings from the environment, validated once at start-up so a typo fails loudly.
import * as z from 'zod';
import { DEFAULT_POOL_KEEP } from './db';

const env = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  DATABASE_URL: z.string().startsWith('postgres://'),
  PORT: z.coerce.number().int().min(0).max(65535).default(5180),
  HOST: z.string().default('127.0.0.1'),
  PUBLIC_URL: z.string().url().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(2525),
  SMTP_SECURE: z.enum(['true', 'false']).default('false'),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default('Twistlog <no-reply@twistlog.invalid>'),
  /** Photos on this machine's disk, used only when S3_BUCKET is not set (one instance, development). */
  PHOTO_DIR: z.string().default('.data/photos'),
  /** Photos in S3-compatible object storage (storage/s3-store.ts): any number of instances share it. */
  S3_BUCKET: z.string().min(3).max(63).optional(),
  S3_ENDPOINT: z.string().url().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_FORCE_PATH_STYLE: z.enum(['true', 'false']).optional(),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  /** The local mail sink's list of caught messages (development): serves /dev/mailbox. */
  MAIL_SINK_URL: z.string().url().optional(),
  /** After SIGTERM, how long the instance keeps serving while it answers 503 to readiness probes. */
  DRAIN_DELAY_MS: z.coerce.number().int().min(0).default(0),
  /** How long SIGTERM then waits for requests in flight before it cuts them. */
  DRAIN_TIMEOUT_MS: z.coerce.number().int().min(0).default(20_000),
  KEEP_ALIVE_TIMEOUT_MS: z.coerce.number().int().min(1000).default(65_000),
  TRUST_PROXY: z.string().default('false'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'silent']).default('info'),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /** Connections kept open while the instance is quiet (db.ts PoolKeep); at most DB_POOL_MAX. */
  DB_POOL_MIN: z.coerce.number().int().min(0).max(100).default(DEFAULT_POOL_KEEP.min),
  /** How long a connection beyond DB_POOL_MIN may sit unused before it is closed. */
  DB_POOL_IDLE_MS: z.coerce.number().int().min(1000).default(DEFAULT_POOL_KEEP.idleMs),
  /** Memory for finished review and pull answers, per instance (http/answer-cache.ts); 0 keeps none. */
  ANSWER_CACHE_MB: z.coerce.number().int().min(0).max(16_384).default(64),
});

export type Config = z.infer<typeof env> & { publicUrl: string };

export function loadConfig(source: NodeJS.ProcessEnv = process.env): Config {
  const parsed = env.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`bad environment settings:\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  return { ...c, publicUrl: c.PUBLIC_URL ?? `http://${c.HOST}:${c.PORT}` };
}
