import { ConnectionError, Sequelize } from 'sequelize';
import pg from 'pg';

// Return DATE columns as 'YYYY-MM-DD' strings and bigint change cursors as numbers
// (the sequence stays far below 2^53 for any workshop's lifetime).
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));

export function createSequelize(url: string, poolMax = 10): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true, timestamps: true },
  });
}

/**
 * The database cannot answer right now (connection refused or dropped, shutting down, too many
 * connections) or a transaction lost a race it may win next time: a 503, try again, never a 500
 * (a 500 tells the field client the request itself is at fault).
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  if (err instanceof ConnectionError) return true;
  const e = err as { parent?: { code?: string; message?: string }; original?: { code?: string; message?: string }; code?: string; message?: string };
  const pg = e?.parent ?? e?.original ?? e ?? {};
  const code = typeof pg.code === 'string' ? pg.code : '';
  // A pooled connection the database dropped fails with no SQLSTATE, only its message.
  if (!code) return /connection terminated|connection refused|ECONNRESET|ECONNREFUSED|Connection terminated/i.test(pg.message ?? '');
  return code.startsWith('08') || code.startsWith('57P') || code === '53300' || code === '40001' || code === '40P01';
}
