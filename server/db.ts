import { Sequelize } from 'sequelize';
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
