/**
 * The estimates list's sort indexes, led by the workshop. Under row-level security every list query carries the
 * policy's `workshop_id = <setting>`; with the sort indexes of `2026.12.02T01.10` (archived, column) the first page
 * walked every workshop's newest rows and dropped the others' one by one (with a neighbour of 10 000 newer estimates,
 * 10 000 rows for a page of 25). Led by `workshop_id`, the index holds each workshop's rows in order, and the
 * policy's condition (an integer equality, leakproof) becomes part of the index condition.
 */
import type { MigrationContext } from '../db/migrator';

const COLUMNS = ['updated_at', 'total', 'labour_hours'] as const;

export async function up({ queryInterface }: MigrationContext): Promise<void> {
  for (const column of COLUMNS) {
    await queryInterface.addIndex('estimates', ['workshop_id', 'archived', column], { name: `estimates_workshop_archived_${column}` });
  }
}

export async function down({ queryInterface }: MigrationContext): Promise<void> {
  for (const column of COLUMNS) await queryInterface.removeIndex('estimates', `estimates_workshop_archived_${column}`);
}
