import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * A bounded working copy beside each original photo (longest side SHELLWRIGHT_PHOTO_WORKING_PX, JPEG): pages and
 * PDFs use it, never the original. Photos stored before this have none; it is made on first use.
 */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.addColumn('piece_photos', 'work_name', { type: DataTypes.STRING(80), allowNull: true });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.removeColumn('piece_photos', 'work_name');
}
