// Migrations run with umzug (SequelizeMeta storage), as a step of start and test; never sync().
import { Umzug, SequelizeStorage } from 'umzug';
import type { Sequelize } from 'sequelize';
import pg from 'pg';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const migrationsDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../migrations');

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: {
      glob: ['[0-9]*.ts', { cwd: migrationsDir }],
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => (await import(pathToFileURL(file!).href)).up({ context, name }),
        down: async () => (await import(pathToFileURL(file!).href)).down({ context, name }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  });
}

/**
 * Applies pending migrations. Several instances may start at once: each waits for a PostgreSQL
 * advisory lock held on one connection of its own, so the first runs the migrations and the others
 * then find nothing left to do.
 */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  // A connection outside the pool, so a pool of one still has a connection for the migrations.
  const { host, port, database, username, password } = sequelize.config;
  const lock = new pg.Client({ host, port: Number(port), database, user: username, password: password ?? undefined });
  await lock.connect();
  try {
    await lock.query(`SELECT pg_advisory_lock(hashtextextended('twistlog-migrations', 0))`);
    const done = await migrator(sequelize).up();
    return done.map((m) => m.name);
  } finally {
    await lock.end();
  }
}
