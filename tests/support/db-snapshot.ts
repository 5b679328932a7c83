// "Nothing was written": every row of the given workshops, of their people, and of the tables
// keyed by them, hashed per table. Used where a refused request must leave the database as it was.
import { QueryTypes, type Sequelize } from 'sequelize';

export interface ScopedTable {
  table: string;
  where: string;
}

/** Every table that holds something of a workshop or a person, with the condition that selects it. */
export async function scopedTables(sequelize: Sequelize): Promise<ScopedTable[]> {
  const cols = await sequelize.query<{ table_name: string; column_name: string }>(
    `SELECT c.table_name, c.column_name FROM information_schema.columns c
     JOIN information_schema.tables t ON t.table_schema = c.table_schema AND t.table_name = c.table_name
     WHERE c.table_schema = 'public' AND t.table_type = 'BASE TABLE'`,
    { type: QueryTypes.SELECT },
  );
  const byTable = new Map<string, Set<string>>();
  for (const c of cols) {
    if (!byTable.has(c.table_name)) byTable.set(c.table_name, new Set());
    byTable.get(c.table_name)!.add(c.column_name);
  }
  const out: ScopedTable[] = [];
  for (const [table, names] of byTable) {
    if (table === 'teams') out.push({ table, where: 'id IN (:teams)' });
    else if (table === 'users') out.push({ table, where: 'id IN (:users)' });
    else if (names.has('team_id')) out.push({ table, where: 'team_id IN (:teams)' });
    else if (names.has('user_id')) out.push({ table, where: 'user_id IN (:users)' });
    // Tables keyed by neither (migration bookkeeping, pending sign-ups, throttle counters) hold nothing of a workshop.
  }
  return out;
}

/** Per table: row count and a hash of every row of these workshops and people. */
export async function snapshot(sequelize: Sequelize, tables: ScopedTable[], teams: string[], users: string[]): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const { table, where } of tables) {
    const [row] = await sequelize.query<{ n: number; h: string }>(
      `SELECT count(*)::int AS n, coalesce(md5(string_agg(t::text, '|' ORDER BY t::text)), '') AS h FROM "${table}" t WHERE ${where}`,
      { replacements: { teams, users }, type: QueryTypes.SELECT },
    );
    out[table] = `${row.n}:${row.h}`;
  }
  return out;
}

export function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  return Object.keys(before).filter((t) => before[t] !== after[t]);
}

/** Insert one row with plain SQL (objects go in as JSON). */
export async function insertRow(sequelize: Sequelize, table: string, row: Record<string, unknown>): Promise<void> {
  const cols = Object.keys(row);
  await sequelize.query(`INSERT INTO ${table} (${cols.join(', ')}) VALUES (${cols.map((c) => `:${c}`).join(', ')})`, {
    replacements: Object.fromEntries(
      Object.entries(row).map(([k, v]) => [k, v !== null && typeof v === 'object' && !(v instanceof Date) ? JSON.stringify(v) : v]),
    ),
  });
}
