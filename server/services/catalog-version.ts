/**
 * The version of the catalog the estimator reads, before and after a change to the price list or settings. The
 * version is loadCatalog's content hash, so it moves exactly when what the estimator would price today moves.
 * Repricing open estimates can hang off the `changed` flag.
 */
import type { Sequelize } from 'sequelize';
import type { CatalogVersionChange } from '@shared/schemas/price-list';
import { HttpProblem } from '../http/problem';
import { loadCatalog } from './catalog';

/** The catalog version in force on a date (today by default), or null while the catalog is incomplete. */
export async function catalogVersion(sequelize: Sequelize, onDate?: string): Promise<string | null> {
  try {
    return (await loadCatalog(sequelize, { onDate })).catalog.version;
  } catch (err) {
    if (err instanceof HttpProblem && err.status < 500) return null;
    throw err;
  }
}

/**
 * Runs a committed write (its own transaction) and reports how it moved the catalog version: read before it
 * starts and after it commits, outside the write's transaction.
 *
 * @example const { result, catalogVersion } = await withCatalogVersionChange(sequelize, () => sequelize.transaction(…));
 */
export async function withCatalogVersionChange<T>(sequelize: Sequelize, write: () => Promise<T>): Promise<{ result: T; catalogVersion: CatalogVersionChange }> {
  const from = await catalogVersion(sequelize);
  const result = await write();
  const to = await catalogVersion(sequelize);
  return { result, catalogVersion: { from, to, changed: from !== to } };
}
