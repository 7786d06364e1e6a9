import { Sequelize } from 'sequelize';
import pg from 'pg';

// PostgreSQL returns bigint (e.g. COUNT(*)) as text by default; our counts fit in a double.
pg.types.setTypeParser(20, (v: string) => Number(v));

export function createSequelize(databaseUrl: string, poolMax = 10): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: poolMax, min: 0, idle: 10_000 },
    define: { underscored: true },
  });
}
