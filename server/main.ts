// The server process: connect, migrate (under a lock, so several instances starting at once run
// each migration once), optionally seed the demo workshop, listen, and say it is ready. SIGTERM or
// SIGINT drains it: no longer ready, no new connections, requests in flight finished, then exit.
// `--migrate-only` migrates (and seeds, with `--seed-demo`) and exits: a release step.
import path from 'node:path';
import http from 'node:http';
import { pino } from 'pino';
import type { Router } from 'express';
import { loadConfig } from './config';
import { createSequelize } from './db';
import { initModels } from './models';
import { migrate } from './migrate';
import { createApp } from './app';
import { seedDemo, DEMO_SIGN_IN } from './seed/demo';
import { configureMailer } from './mail/mailer';
import { createMailboxRouter, remoteMailbox } from './mail/mailbox';
import { setAppUrl } from './mail/templates';
import { schedulePruning } from './services/prune';
import { drain, lifecycle } from './http/lifecycle';
import { photoStore } from './storage/photo-store';
import { repoRoot } from './paths';

async function main() {
  const started = performance.now();
  const config = loadConfig();
  const logger = pino({ level: config.LOG_LEVEL });
  const sequelize = createSequelize(config.DATABASE_URL, config.DB_POOL_MAX, { min: config.DB_POOL_MIN, idleMs: config.DB_POOL_IDLE_MS });
  initModels(sequelize);
  const applied = await migrate(sequelize);
  if (applied.length) logger.info({ applied }, 'migrations applied');
  if (process.argv.includes('--seed-demo')) {
    const seeded = await seedDemo();
    logger.info(seeded ? 'demo workshop seeded' : 'demo workshop already present');
  }
  if (process.argv.includes('--migrate-only')) {
    await sequelize.close();
    return;
  }
  // E-mail goes to SMTP_HOST:SMTP_PORT: the local sink under `npm start` (whose caught messages
  // MAIL_SINK_URL lists for the development mailbox), a real server in production.
  setAppUrl(config.publicUrl);
  configureMailer({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: config.SMTP_SECURE === 'true',
    user: config.SMTP_USER,
    pass: config.SMTP_PASS,
    from: config.MAIL_FROM,
  });
  const extraRouters: Router[] = [];
  if (config.MAIL_SINK_URL && config.NODE_ENV !== 'production') extraRouters.push(createMailboxRouter(remoteMailbox(config.MAIL_SINK_URL), config.NODE_ENV));
  const stopPruning = schedulePruning((err) => logger.error({ err }, 'pruning old rows failed'));
  const app = createApp({
    logger,
    clientDir: process.env.CLIENT_DIR ?? path.join(repoRoot, 'dist'),
    trustProxy: config.TRUST_PROXY,
    extraRouters,
    production: config.NODE_ENV === 'production',
    answerCacheBytes: config.ANSWER_CACHE_MB * 1024 * 1024,
  });
  const server = http.createServer(app);
  // Longer than a proxy's idle timeout, so the proxy, not this server, closes idle connections.
  server.keepAliveTimeout = config.KEEP_ALIVE_TIMEOUT_MS;
  await new Promise<void>((resolve) => server.listen(config.PORT, config.HOST, resolve));
  lifecycle.markReady();
  logger.info({ ms: Math.round(performance.now() - started), photos: photoStore().where }, 'ready');
  const url = config.publicUrl;
  process.stdout.write(`\nTwistlog is running at ${url}\n`);
  if (extraRouters.length) process.stdout.write(`Mailbox (every e-mail the app sends): ${url}/dev/mailbox\n`);
  if (process.argv.includes('--seed-demo'))
    process.stdout.write(`Demo sign-in: ${DEMO_SIGN_IN.email} / ${DEMO_SIGN_IN.password} (engineer; more in the README)\n\n`);

  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    stopPruning();
    const { cut } = await drain(server, { delayMs: config.DRAIN_DELAY_MS, timeoutMs: config.DRAIN_TIMEOUT_MS });
    if (cut) logger.warn({ cut }, 'requests still running when the drain time ran out were cut');
    await sequelize.close().catch(() => {});
    process.exit(0);
  };
  process.on('SIGINT', () => void stop());
  process.on('SIGTERM', () => void stop());
  // Started by another process (npm start, a test): if it is gone, killed outright, stop too.
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) void stop();
  }, 1000).unref();
}

main().catch((err) => {
  process.stderr.write(`Twistlog failed to start: ${err?.stack ?? err}\n`);
  process.exit(1);
});
