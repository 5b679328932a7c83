// The registry (shared/records) against the migrated database: every synced table's columns, with
// their types and nullability, as information_schema reports them after all migrations. A field
// added to a record without its migration (or a migration without its field) fails here.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { startTestServer, type TestServer } from '../support/test-app';
import { records, syncEntities } from '../../shared/records';
import { tableColumns } from '../../shared/records/define';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const describeColumn = (c: { column: string; type: string; nullable: boolean }) => `${c.column} ${c.type}${c.nullable ? ' null' : ' not null'}`;

describe('the record registry and the database', () => {
  it.each(syncEntities)('%s: the registry declares exactly the columns of its table, with their types and nullability', async (entity) => {
    const def = records[entity];
    const rows = await ts.sequelize.query<{ column_name: string; udt_name: string; is_nullable: 'YES' | 'NO' }>(
      `SELECT column_name, udt_name, is_nullable FROM information_schema.columns WHERE table_schema = current_schema() AND table_name = :table`,
      { replacements: { table: def.table }, type: QueryTypes.SELECT },
    );
    expect(rows.length, `table ${def.table}`).toBeGreaterThan(0);
    const inDatabase = rows.map((r) => describeColumn({ column: r.column_name, type: r.udt_name, nullable: r.is_nullable === 'YES' })).sort();
    const inRegistry = tableColumns(def).map(describeColumn).sort();
    expect(inRegistry).toEqual(inDatabase);
  });
});
