// Migrations run with umzug (SequelizeMeta storage), as a step of start and test; never sync().
import fs from 'node:fs';
import type { Sequelize } from 'sequelize';
import pg from 'pg';
import path from 'node:path';
import { repoRoot } from './paths';

const migrationsDir = path.join(repoRoot, 'migrations');
// A pattern import: the bundled server carries every migration (esbuild bundles what it matches).
const loadMigration = (name: string) => import(`../migrations/${name.replace(/\.ts$/, '')}.ts`) as Promise<{ up: MigrationStep; down: MigrationStep }>;
type MigrationStep = (params: { context: unknown; name: string }) => Promise<void>;

/**
 * The table umzug records applied migrations in. Its model is SequelizeMeta, but the app's
 * `underscored` setting names the table sequelize_meta: the start-up check below reads the same
 * name, or it would find every migration pending and build the migrator at every start.
 */
const META_TABLE = 'sequelize_meta';

/** umzug is loaded only when a migration is pending: an instance starting on a current schema skips it. */
async function migrator(sequelize: Sequelize) {
  const { Umzug, SequelizeStorage } = await import('umzug');
  return new Umzug({
    migrations: {
      glob: ['[0-9]*.ts', { cwd: migrationsDir }],
      resolve: ({ name, context }) => ({
        name,
        up: async () => (await loadMigration(name)).up({ context, name }),
        down: async () => (await loadMigration(name)).down({ context, name }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: META_TABLE }),
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
  // Sequelize's first connection reads PostgreSQL's type table (a tenth of a second): it opens
  // meanwhile, so an instance starting on a current schema is not kept waiting twice.
  const poolReady = sequelize.authenticate();
  poolReady.catch(() => {}); // awaited below; a failure there is the one reported
  try {
    await lock.connect();
    await lock.query(`SELECT pg_advisory_lock(hashtextextended('twistlog-migrations', 0))`);
    const pending = await anyPending(lock);
    await poolReady;
    if (!pending) return [];
    const done = await (await migrator(sequelize)).up();
    return done.map((m) => m.name);
  } finally {
    await lock.end();
  }
}

/** Whether a migration file has no row in umzug's table (or the table is missing). */
async function anyPending(db: pg.Client): Promise<boolean> {
  const files = fs.readdirSync(migrationsDir).filter((f) => /^[0-9].*\.ts$/.test(f));
  const {
    rows: [table],
  } = await db.query<{ present: boolean }>('SELECT to_regclass($1) IS NOT NULL AS present', [META_TABLE]);
  if (!table.present) return files.length > 0;
  const { rows } = await db.query<{ name: string }>(`SELECT name FROM ${META_TABLE}`);
  const applied = new Set(rows.map((r) => r.name));
  return files.some((f) => !applied.has(f));
}
