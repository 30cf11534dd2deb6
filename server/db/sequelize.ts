import { Sequelize } from 'sequelize';

/** Opens a Sequelize connection pool (no sync(): the schema comes from migrations). */
export function createSequelize(url: string, opts: { poolMax?: number } = {}): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: opts.poolMax ?? 10, min: 0, idle: 10_000, acquire: 5_000 },
    dialectOptions: { connectionTimeoutMillis: 3_000, application_name: 'shellwright' },
    define: { underscored: true },
  });
}
