import { Sequelize } from 'sequelize';
import { installWorkshopSetting } from './workshop-context';

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

/**
 * The application's pool (the `shellwright_app` role): every connection it hands out carries the workshop setting
 * of the work that takes it (server/db/workshop-context.ts). `fallback` is for the test helpers only.
 */
export function createAppSequelize(url: string, opts: { poolMax?: number; fallback?: () => Promise<number | null> } = {}): Sequelize {
  const sequelize = createSequelize(url, opts);
  installWorkshopSetting(sequelize, { fallback: opts.fallback });
  return sequelize;
}
