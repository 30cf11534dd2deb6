import { DataTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * Workshop planning: polishers, jobs from accepted quotes with their sessions (planned, then done with actual
 * hours and the day's climate), and stock on hand per material. Board times are local date-times without a time
 * zone ("2026-12-07T08:00"), as in the coat calendar; they sort as text.
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.createTable('polishers', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    hours_per_day: { type: DataTypes.DECIMAL(4, 2), allowNull: false },
    days_off: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });

  await sequelize.query('CREATE SEQUENCE job_number_seq START 1');
  await queryInterface.createTable('jobs', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'RESTRICT' },
    estimate_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimates', key: 'id' }, onDelete: 'RESTRICT' },
    revision_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimate_revisions', key: 'id' }, onDelete: 'RESTRICT' },
    customer_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'customers', key: 'id' }, onDelete: 'RESTRICT' },
    title: { type: DataTypes.STRING(200), allowNull: false },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'unbooked' },
    bays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    area_m2: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
    /** The quoted stages' hours and materials (flakes and spirit folded in), copied from the revision. */
    stages: { type: DataTypes.JSONB, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    room_start: { type: DataTypes.STRING(16), allowNull: true },
    room_end: { type: DataTypes.STRING(16), allowNull: true },
    start_mode: { type: DataTypes.STRING(10), allowNull: true },
    forced: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    overbooking: { type: DataTypes.JSONB, allowNull: true },
    why_not_sooner: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    booked_at: { type: DataTypes.DATE, allowNull: true },
    booked_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    finished_at: { type: DataTypes.DATE, allowNull: true },
    cancelled_at: { type: DataTypes.DATE, allowNull: true },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  // One live job per quote; a cancelled one may be followed by another.
  await sequelize.query(`CREATE UNIQUE INDEX jobs_live_quote ON jobs (quote_id) WHERE state <> 'cancelled'`);
  await queryInterface.addIndex('jobs', ['state', 'room_start'], { name: 'jobs_state_room' });

  await queryInterface.createTable('job_sessions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    job_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'jobs', key: 'id' }, onDelete: 'CASCADE' },
    idx: { type: DataTypes.INTEGER, allowNull: false },
    stage: { type: DataTypes.STRING(64), allowNull: false },
    stage_kind: { type: DataTypes.STRING(16), allowNull: false },
    stage_name: { type: DataTypes.STRING(80), allowNull: false },
    session: { type: DataTypes.INTEGER, allowNull: false },
    of_sessions: { type: DataTypes.INTEGER, allowNull: false },
    hands_on_min: { type: DataTypes.INTEGER, allowNull: false },
    rest_min: { type: DataTypes.INTEGER, allowNull: false },
    estimated_hours: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
    planned_start: { type: DataTypes.STRING(16), allowNull: true },
    planned_end: { type: DataTypes.STRING(16), allowNull: true },
    rest_until: { type: DataTypes.STRING(16), allowNull: true },
    segments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    baseline_start: { type: DataTypes.STRING(16), allowNull: true },
    baseline_end: { type: DataTypes.STRING(16), allowNull: true },
    polisher_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'polishers', key: 'id' }, onDelete: 'SET NULL' },
    done: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    actual_end: { type: DataTypes.STRING(16), allowNull: true },
    actual_hours: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
    temperature_c: { type: DataTypes.DECIMAL(4, 1), allowNull: true },
    humidity_pct: { type: DataTypes.DECIMAL(4, 1), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    done_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    done_at: { type: DataTypes.DATE, allowNull: true },
  });
  await queryInterface.addIndex('job_sessions', ['job_id', 'idx'], { name: 'job_sessions_job_idx', unique: true });
  await queryInterface.addIndex('job_sessions', ['planned_start'], { name: 'job_sessions_start' });

  await queryInterface.createTable('material_stock', {
    material_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'materials', key: 'id' }, onDelete: 'CASCADE' },
    /** In the material's own unit (g, mL, sheet, each). */
    quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: 0 },
    updated_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  await queryInterface.dropTable('material_stock');
  await queryInterface.dropTable('job_sessions');
  await queryInterface.dropTable('jobs');
  await sequelize.query('DROP SEQUENCE IF EXISTS job_number_seq');
  await queryInterface.dropTable('polishers');
}
