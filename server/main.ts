// The server process: connect, migrate, optionally seed the demo workshop, listen.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { pino } from 'pino';
import type { Router } from 'express';
import { loadConfig } from './config';
import { createSequelize } from './db';
import { initModels } from './models';
import { migrate } from './migrate';
import { createApp } from './app';
import { seedDemo, DEMO_SIGN_IN } from './seed/demo';
import { configureMailer } from './mail/mailer';
import { startMailSink } from './mail/sink';
import { createMailboxRouter } from './mail/mailbox';
import { setAppUrl } from './mail/templates';
import { schedulePruning } from './services/prune';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

async function main() {
  const config = loadConfig();
  const logger = pino({ level: config.LOG_LEVEL });
  const sequelize = createSequelize(config.DATABASE_URL, config.DB_POOL_MAX);
  initModels(sequelize);
  const applied = await migrate(sequelize);
  if (applied.length) logger.info({ applied }, 'migrations applied');
  if (process.argv.includes('--seed-demo')) {
    const seeded = await seedDemo();
    logger.info(seeded ? 'demo workshop seeded' : 'demo workshop already present');
  }
  // E-mail: links point at the public URL; `--mail-sink` (npm start) catches every message in a
  // local SMTP sink on SMTP_PORT instead of sending it, and the development mailbox lists them.
  setAppUrl(config.publicUrl);
  const extraRouters: Router[] = [];
  let mailSink: Awaited<ReturnType<typeof startMailSink>> | undefined;
  if (process.argv.includes('--mail-sink')) {
    mailSink = await startMailSink({ port: config.SMTP_PORT, host: '127.0.0.1' });
    configureMailer({ host: '127.0.0.1', port: mailSink.port, secure: false, from: config.MAIL_FROM });
    if (config.NODE_ENV === 'development') extraRouters.push(createMailboxRouter(mailSink, config.NODE_ENV));
  } else {
    configureMailer({
      host: config.SMTP_HOST,
      port: config.SMTP_PORT,
      secure: config.SMTP_SECURE === 'true',
      user: config.SMTP_USER,
      pass: config.SMTP_PASS,
      from: config.MAIL_FROM,
    });
  }
  const stopPruning = schedulePruning((err) => logger.error({ err }, 'pruning old rows failed'));
  const app = createApp({
    logger,
    clientDir: path.join(root, 'dist'),
    trustProxy: config.TRUST_PROXY,
    extraRouters,
    production: config.NODE_ENV === 'production',
  });
  const server = app.listen(config.PORT, config.HOST, () => {
    const url = config.publicUrl;
    process.stdout.write(`\nTwistlog is running at ${url}\n`);
    if (mailSink && extraRouters.length) process.stdout.write(`Mailbox (every e-mail the app sends): ${url}/dev/mailbox\n`);
    process.stdout.write(`Demo sign-in: ${DEMO_SIGN_IN.email} / ${DEMO_SIGN_IN.password} (engineer; more in the README)\n\n`);
  });
  const stop = () => {
    stopPruning();
    void mailSink?.close();
    server.close(() => sequelize.close().finally(() => process.exit(0)));
    setTimeout(() => process.exit(0), 3000).unref();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  // Started by another process (npm start, a test): if it is gone, killed outright, stop too.
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) stop();
  }, 1000).unref();
}

main().catch((err) => {
  process.stderr.write(`Twistlog failed to start: ${err?.stack ?? err}\n`);
  process.exit(1);
});
