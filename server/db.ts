import { ConnectionError, Sequelize, type Transaction } from 'sequelize';
import pg from 'pg';

// Return DATE columns as 'YYYY-MM-DD' strings and bigint change cursors as numbers
// (the sequence stays far below 2^53 for any workshop's lifetime).
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));

/**
 * Every connection's time limits: no request waits long on a row or table someone else holds
 * (lock_timeout; the answer is a 503 to retry, http/error-handler.ts), no statement runs away
 * (statement_timeout), and no transaction left idle keeps its locks.
 */
export const DB_TIMEOUTS = { statementMs: 30_000, lockMs: 5_000, idleInTransactionMs: 60_000 };

/**
 * How many connections an instance keeps open while it is quiet, and how long a connection beyond
 * those may sit unused before it is closed. An instance that closed every connection after a
 * pause opens them again on the next burst, each with a new PostgreSQL backend (a fork and a
 * sign-in), in the requests of that burst. Kept connections cost PostgreSQL memory only: the
 * slots are counted against max_connections at DB_POOL_MAX either way (README, Deployment).
 */
export interface PoolKeep {
  min: number;
  idleMs: number;
}

/** Two connections kept, the rest closed after a minute unused (config.ts DB_POOL_MIN, DB_POOL_IDLE_MS). */
export const DEFAULT_POOL_KEEP: PoolKeep = { min: 2, idleMs: 60_000 };

export function createSequelize(url: string, poolMax = 10, keep: PoolKeep = DEFAULT_POOL_KEEP): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    dialectOptions: {
      statement_timeout: DB_TIMEOUTS.statementMs,
      lock_timeout: DB_TIMEOUTS.lockMs,
      idle_in_transaction_session_timeout: DB_TIMEOUTS.idleInTransactionMs,
      // Who holds a connection, in pg_stat_activity.
      application_name: 'twistlog',
    },
    logging: false,
    pool: { max: poolMax, min: Math.min(keep.min, poolMax), idle: keep.idleMs, acquire: 30_000 },
    define: { underscored: true, timestamps: true },
  });
}

/**
 * A SELECT run as a named prepared statement on one of the pool's connections: PostgreSQL parses
 * and plans it once per connection, not on every call. For the small statements every request
 * runs (the session look-up, the answer validators), planning costs more than running: the
 * session's four-table join took 2.4–3.0 ms a call planned each time and 0.8–0.9 ms prepared
 * (`SELECT 1`: 0.3–0.7 ms), on the development machine under load. `text` must be a constant
 * for `name`. Needs session-level connections to PostgreSQL (a pooler in transaction mode drops
 * prepared statements before PgBouncer 1.21).
 */
export async function preparedSelect<T extends object>(sequelize: Sequelize, name: string, text: string, values: unknown[]): Promise<T[]> {
  const manager = sequelize.connectionManager;
  const connection = (await manager.getConnection({ type: 'read' })) as pg.Client;
  try {
    return (await connection.query<T>({ name, text, values })).rows;
  } finally {
    manager.releaseConnection(connection);
  }
}

/**
 * A statement on a transaction's connection straight through pg, for the statements a push sends
 * with every batch: Sequelize's own work per statement (its options, hooks and retry wrapper, and
 * a pass over every string parameter for NUL characters: 250 kB of JSON in a batch of readings,
 * where JSON.stringify never leaves one) is skipped. With `name`, a named prepared statement (as
 * preparedSelect, for a text that never changes): PostgreSQL plans `id = ANY($1)` once instead of
 * weighing each of a thousand ids on every call. An error is pg's own (code, constraint, detail),
 * as isDatabaseUnavailable and sync-db-errors.ts read them.
 */
export async function queryIn<T extends object>(transaction: Transaction, text: string, values?: unknown[], name?: string): Promise<T[]> {
  const connection = (transaction as unknown as { connection: pg.Client }).connection;
  return (await connection.query<T>(name ? { name, text, values } : { text, values })).rows;
}

export const preparedIn = <T extends object>(transaction: Transaction, name: string, text: string, values: unknown[]) =>
  queryIn<T>(transaction, text, values, name);

export type Unavailability = 'unreachable' | 'locked' | 'slow' | 'busy';

/**
 * Why the database cannot answer right now, or null when the failure is not a passing one:
 * unreachable (connection refused or dropped, shutting down or starting), locked (lock_timeout),
 * slow (statement_timeout or a cancel), busy (no free connection slot, or a transaction that lost
 * a serialization or deadlock race it may win next time). Any of these is a 503 to retry, never a
 * 500: a 500 tells the field client the request itself is at fault.
 */
export function databaseUnavailability(err: unknown): Unavailability | null {
  if (err instanceof ConnectionError) return 'unreachable';
  const e = err as { parent?: { code?: string; message?: string }; original?: { code?: string; message?: string }; code?: string; message?: string };
  const pg = e?.parent ?? e?.original ?? e ?? {};
  const code = typeof pg.code === 'string' ? pg.code : '';
  // A pooled connection the database dropped fails with no SQLSTATE, only its message.
  if (!code) return /connection terminated|connection refused|ECONNRESET|ECONNREFUSED/i.test(pg.message ?? '') ? 'unreachable' : null;
  if (code === '55P03') return 'locked';
  if (code === '57014') return 'slow';
  if (code.startsWith('08') || code.startsWith('57P')) return 'unreachable';
  if (code === '53300' || code === '40001' || code === '40P01') return 'busy';
  return null;
}

export const isDatabaseUnavailable = (err: unknown): boolean => databaseUnavailability(err) !== null;
