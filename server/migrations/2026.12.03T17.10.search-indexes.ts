import type { MigrationContext } from '../db/migrator';

/**
 * Trigram indexes (pg_trgm, shipped with PostgreSQL's contrib modules and trusted, so the database's owner may
 * create it) for the search boxes: a `%text%` ILIKE on these columns reads the index instead of every row. The
 * estimates search also looks up matching customers and pieces and then their estimates by customer or piece.
 */
const TRIGRAM: [table: string, column: string][] = [
  ['estimates', 'number'],
  ['estimates', 'title'],
  ['customers', 'name'],
  ['customers', 'email'],
  ['customers', 'phone'],
  ['pieces', 'description'],
  ['quotes', 'number'],
  ['quotes', 'recipient'],
];

export async function up({ sequelize, queryInterface }: MigrationContext): Promise<void> {
  await sequelize.query('CREATE EXTENSION IF NOT EXISTS pg_trgm');
  for (const [table, column] of TRIGRAM) {
    await sequelize.query(`CREATE INDEX ${table}_${column}_trgm ON ${table} USING gin (${column} gin_trgm_ops)`);
  }
  await queryInterface.addIndex('estimates', ['piece_id'], { name: 'estimates_piece' });
}

export async function down({ sequelize, queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.removeIndex('estimates', 'estimates_piece');
  for (const [table, column] of TRIGRAM) await sequelize.query(`DROP INDEX ${table}_${column}_trgm`);
  await sequelize.query('DROP EXTENSION IF EXISTS pg_trgm');
}
