// An instance's pool after a burst and a quiet spell: the connections beyond DB_POOL_MIN close once
// idle, the kept ones stay open (db.ts PoolKeep), so the next burst starts on open connections
// rather than forking PostgreSQL backends mid-request.
import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { createSequelize, DEFAULT_POOL_KEEP } from '../../server/db';
import { loadConfig } from '../../server/config';

const url = process.env.DATABASE_URL!;
const pools: Sequelize[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
});

/** The backend pids of `n` connections the pool opened at once (each query holds one for 100 ms). */
async function burst(pool: Sequelize, n: number): Promise<number[]> {
  const rows = await Promise.all(
    Array.from({ length: n }, () => pool.query<{ pid: number }>('SELECT pg_backend_pid() AS pid, pg_sleep(0.1)', { type: QueryTypes.SELECT, plain: true })),
  );
  return [...new Set(rows.map((r) => r!.pid))];
}

/** Which of `pids` still have a backend, asked on a connection of another pool. */
async function alive(observer: Sequelize, pids: number[]): Promise<number[]> {
  const rows = await observer.query<{ pid: number }>('SELECT pid FROM pg_stat_activity WHERE pid = ANY($1::int[])', {
    bind: [pids],
    type: QueryTypes.SELECT,
  });
  return rows.map((r) => r.pid);
}

describe('the connection pool', () => {
  it('keeps DB_POOL_MIN connections through a quiet spell and closes the rest', async () => {
    const observer = createSequelize(url, 1);
    const pool = createSequelize(url, 6, { min: 2, idleMs: 1000 });
    pools.push(observer, pool);
    const pids = await burst(pool, 6);
    expect(pids).toHaveLength(6);
    // Idle 1 s, then the pool's next check (every second) closes what is beyond the minimum.
    await new Promise((r) => setTimeout(r, 3000));
    expect(await alive(observer, pids)).toHaveLength(2);
    // The next burst finds the two open and opens only what it needs besides them.
    const again = await burst(pool, 2);
    expect(again.every((pid) => pids.includes(pid))).toBe(true);
  });

  it('reads DB_POOL_MIN and DB_POOL_IDLE_MS from the environment, else keeps the defaults', () => {
    const base = { DATABASE_URL: url };
    expect(loadConfig(base)).toMatchObject({ DB_POOL_MIN: DEFAULT_POOL_KEEP.min, DB_POOL_IDLE_MS: DEFAULT_POOL_KEEP.idleMs });
    const config = loadConfig({ ...base, DB_POOL_MIN: '0', DB_POOL_IDLE_MS: '5000' });
    expect([config.DB_POOL_MIN, config.DB_POOL_IDLE_MS]).toEqual([0, 5000]);
    expect(() => loadConfig({ ...base, DB_POOL_IDLE_MS: '10' })).toThrow(/DB_POOL_IDLE_MS/);
  });
});
