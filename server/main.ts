// The server process: connect, migrate, optionally seed the demo workshop, listen.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { pino } from 'pino';
import { loadConfig } from './config';
import { createSequelize } from './db';
import { initModels } from './models';
import { migrate } from './migrate';
import { createApp } from './app';
import { seedDemo, DEMO_SIGN_IN } from './seed/demo';

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
  const app = createApp({ logger, clientDir: path.join(root, 'dist'), trustProxy: config.TRUST_PROXY });
  const server = app.listen(config.PORT, config.HOST, () => {
    const url = config.publicUrl;
    process.stdout.write(`\nTwistlog is running at ${url}\n`);
    process.stdout.write(`Demo sign-in: ${DEMO_SIGN_IN.email} / ${DEMO_SIGN_IN.password} (engineer; more in the README)\n\n`);
  });
  const stop = () => {
    server.close(() => sequelize.close().finally(() => process.exit(0)));
    setTimeout(() => process.exit(0), 3000).unref();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  process.stderr.write(`Twistlog failed to start: ${err?.stack ?? err}\n`);
  process.exit(1);
});
