// The start-up migration check: an instance starting on a schema that is already current finds
// nothing pending and never builds the migrator (umzug and what it loads took most of a cold
// start, because the check read a table name the app's `underscored` setting never creates).
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { migrate } from '../../server/migrate';

const built = vi.hoisted(() => ({ migrators: 0 }));
vi.mock('umzug', async (importOriginal) => {
  const real = await importOriginal<typeof import('umzug')>();
  class CountedUmzug<Ctx extends object> extends real.Umzug<Ctx> {
    constructor(...args: ConstructorParameters<typeof real.Umzug<Ctx>>) {
      built.migrators += 1;
      super(...args);
    }
  }
  return { ...real, Umzug: CountedUmzug };
});

let sequelize: Sequelize;
beforeAll(async () => {
  sequelize = createSequelize(process.env.DATABASE_URL!, 2);
  await migrate(sequelize);
});
afterAll(async () => sequelize.close());

describe('the migration check at start', () => {
  it('finds nothing pending on a current schema and never builds the migrator', async () => {
    built.migrators = 0;
    expect(await migrate(sequelize)).toEqual([]);
    expect(built.migrators).toBe(0);
  });
});
