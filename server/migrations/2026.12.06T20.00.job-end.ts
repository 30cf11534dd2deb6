import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * The rest of a job after the deposit: where the piece is (awaiting collection, in the workshop, ready, returned),
 * the collection and return dates and arrangements, the hand kept on the job, staff notes, progress photos shared
 * with the customer, work found during the job (variations the customer approves through a signed link) and the
 * job's events (what the customer's page and the messages read).
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.addColumn('jobs', 'custody', { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'awaiting-collection' });
  await queryInterface.addColumn('jobs', 'collection_date', { type: DataTypes.DATEONLY, allowNull: true });
  await queryInterface.addColumn('jobs', 'collection_arrangement', { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' });
  await queryInterface.addColumn('jobs', 'return_date', { type: DataTypes.DATEONLY, allowNull: true });
  await queryInterface.addColumn('jobs', 'return_arrangement', { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' });
  await queryInterface.addColumn('jobs', 'collected_on', { type: DataTypes.DATEONLY, allowNull: true });
  await queryInterface.addColumn('jobs', 'completed_on', { type: DataTypes.DATEONLY, allowNull: true });
  await queryInterface.addColumn('jobs', 'returned_on', { type: DataTypes.DATEONLY, allowNull: true });
  await queryInterface.addColumn('jobs', 'kept_polisher_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'polishers', key: 'id' }, onDelete: 'SET NULL' });
  await queryInterface.addColumn('jobs', 'keep_scope', { type: DataTypes.STRING(10), allowNull: true });
  await sequelize.query(`ALTER TABLE jobs ADD CONSTRAINT jobs_custody_known CHECK (custody IN ('awaiting-collection', 'in-workshop', 'ready', 'returned'))`);
  await sequelize.query(`ALTER TABLE jobs ADD CONSTRAINT jobs_keep_scope_known CHECK (keep_scope IS NULL OR keep_scope IN ('job', 'bodying'))`);

  await queryInterface.createTable('job_notes', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    job_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'jobs', key: 'id' }, onDelete: 'CASCADE' },
    author_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    body: { type: DataTypes.TEXT, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('job_notes', ['job_id', 'created_at'], { name: 'job_notes_job' });

  await queryInterface.createTable('job_events', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    job_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'jobs', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    actor_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('job_events', ['job_id', 'id'], { name: 'job_events_job' });

  // Progress photos are piece photos taken for a job: the same files, checks and thumbnails.
  await queryInterface.addColumn('piece_photos', 'job_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'jobs', key: 'id' }, onDelete: 'SET NULL' });
  await queryInterface.addColumn('piece_photos', 'phase', { type: DataTypes.STRING(8), allowNull: true });
  await queryInterface.addColumn('piece_photos', 'shared', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
  await sequelize.query(`ALTER TABLE piece_photos ADD CONSTRAINT piece_photos_phase_known CHECK (phase IS NULL OR phase IN ('before', 'during', 'after'))`);
  await queryInterface.addIndex('piece_photos', ['job_id'], { name: 'piece_photos_job' });

  await queryInterface.createTable('job_variations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    job_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'jobs', key: 'id' }, onDelete: 'RESTRICT' },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'RESTRICT' },
    title: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    priced_by: { type: DataTypes.STRING(8), allowNull: false },
    price: { type: DataTypes.DECIMAL(12, 2), allowNull: false },
    hours: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
    /** Staff-only working: the engine's input and its breakdown (never sent to the customer). */
    working: { type: DataTypes.JSONB, allowNull: true },
    state: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'draft' },
    token_hash: { type: DataTypes.STRING(64), allowNull: true, unique: true },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    answered_at: { type: DataTypes.DATE, allowNull: true },
    answer_note: { type: DataTypes.STRING(500), allowNull: true },
    answer_ip: { type: DataTypes.STRING(64), allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await sequelize.query(`ALTER TABLE job_variations ADD CONSTRAINT job_variations_state_known CHECK (state IN ('draft', 'sent', 'approved', 'declined', 'withdrawn'))`);
  await sequelize.query(`ALTER TABLE job_variations ADD CONSTRAINT job_variations_price_positive CHECK (price > 0 AND hours >= 0)`);
  await queryInterface.addIndex('job_variations', ['quote_id', 'state'], { name: 'job_variations_quote' });
  await queryInterface.addIndex('job_variations', ['job_id'], { name: 'job_variations_job' });
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('job_variations');
  await sequelize.query('ALTER TABLE piece_photos DROP CONSTRAINT IF EXISTS piece_photos_phase_known');
  await queryInterface.removeIndex('piece_photos', 'piece_photos_job');
  for (const c of ['shared', 'phase', 'job_id']) await queryInterface.removeColumn('piece_photos', c);
  await queryInterface.dropTable('job_events');
  await queryInterface.dropTable('job_notes');
  for (const c of ['jobs_keep_scope_known', 'jobs_custody_known']) await sequelize.query(`ALTER TABLE jobs DROP CONSTRAINT IF EXISTS ${c}`);
  for (const c of ['keep_scope', 'kept_polisher_id', 'returned_on', 'completed_on', 'collected_on', 'return_arrangement', 'return_date', 'collection_arrangement', 'collection_date', 'custody']) {
    await queryInterface.removeColumn('jobs', c);
  }
}
