// Migrations run with umzug (SequelizeMeta storage), as a step of start and test; never sync().
import { Umzug, SequelizeStorage } from 'umzug';
import type { Sequelize } from 'sequelize';
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

export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await migrator(sequelize).up();
  return done.map((m) => m.name);
}
