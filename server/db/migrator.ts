import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { rootDir } from '../config';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

/** A migration file's exports: a schema change and its working reversal. */
export interface Migration {
  up(ctx: MigrationContext): Promise<void>;
  down(ctx: MigrationContext): Promise<void>;
}

const migrationsDir = path.join(rootDir, 'server', 'migrations');

/** Umzug over Sequelize's query interface; migration files are server/migrations/*.ts, applied in name order. */
export function createMigrator(sequelize: Sequelize, opts: { quiet?: boolean } = {}): Umzug<MigrationContext> {
  return new Umzug<MigrationContext>({
    migrations: {
      glob: ['*.ts', { cwd: migrationsDir, ignore: ['*.d.ts'] }],
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => {
          const mod = (await import(pathToFileURL(file!).href)) as Migration;
          await mod.up(context);
        },
        down: async () => {
          const mod = (await import(pathToFileURL(file!).href)) as Migration;
          await mod.down(context);
        },
      }),
    },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: opts.quiet ? undefined : { info: (e) => logEvent(e), warn: console.warn, error: console.error, debug: () => {} },
  });
}

function logEvent(event: Record<string, unknown>): void {
  if (event.event === 'migrated') process.stdout.write(`[db] migrated ${String(event.name)}\n`);
  if (event.event === 'reverted') process.stdout.write(`[db] reverted ${String(event.name)}\n`);
}
