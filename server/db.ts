import { Sequelize } from 'sequelize';
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

export function createSequelize(url: string, poolMax = 10): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    dialectOptions: {
      statement_timeout: DB_TIMEOUTS.statementMs,
      lock_timeout: DB_TIMEOUTS.lockMs,
      idle_in_transaction_session_timeout: DB_TIMEOUTS.idleInTransactionMs,
    },
    logging: false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true, timestamps: true },
  });
}