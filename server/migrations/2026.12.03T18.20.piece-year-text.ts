import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * A piece's year as written ("c. 1830", "1890s") beside the whole-number year, which stays as the sortable best
 * guess. Years already saved are exact: their text is the number.
 */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.addColumn('pieces', 'year_text', { type: DataTypes.STRING(40), allowNull: true });
  await queryInterface.sequelize.query('UPDATE pieces SET year_text = year::text WHERE year IS NOT NULL');
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.removeColumn('pieces', 'year_text');
}
