import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * A session marked done from the bench also says which materials went on (as the polisher writes them: "250 mL of
 * 2 lb cut, a little pumice") and any problem met (blush, a cut-through edge), kept apart from the notes so that the
 * job page and the planner can pick problems out.
 */
export async function up({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.addColumn('job_sessions', 'materials_used', { type: DataTypes.TEXT, allowNull: true });
  await queryInterface.addColumn('job_sessions', 'problem', { type: DataTypes.TEXT, allowNull: true });
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  await queryInterface.removeColumn('job_sessions', 'problem');
  await queryInterface.removeColumn('job_sessions', 'materials_used');
}
