import { DataTypes, QueryTypes } from 'sequelize';
import type { MigrationContext } from '../db/migrator';

/**
 * A quote of several pieces, with options: a quote holds lines, each a priced revision of one estimate of one of the
 * customer's pieces. Lines sharing an option group are alternatives for one piece; the customer takes exactly one of
 * a group (or none, where sales marked the group optional). At acceptance the chosen lines are marked `agreed`.
 *
 * The one-agreement rule moves from the quote's estimate to each piece a quote names: `quote_lines_one_agreement` is
 * a unique index on the agreed lines' piece. Jobs are made per chosen line (`jobs.quote_line_id`), one live job a line.
 * Every existing quote becomes a quote of one line (its own estimate and revision, recommended, not optional).
 */
export async function up({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  const twice = await sequelize.query<{ piece_id: number }>(
    `SELECT e.piece_id FROM quotes q JOIN estimates e ON e.id = q.estimate_id
      WHERE q.state IN ('accepted', 'deposit-paid') GROUP BY e.piece_id HAVING count(*) > 1`,
    { type: QueryTypes.SELECT },
  );
  if (twice.length > 0) {
    throw new Error(`Pieces with more than one accepted quote (ids ${twice.map((r) => r.piece_id).join(', ')}): withdraw all but one before migrating.`);
  }
  await queryInterface.createTable('quote_lines', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    quote_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'CASCADE' },
    position: { type: DataTypes.INTEGER, allowNull: false },
    /** Lines with the same group number are alternatives for one piece. */
    option_group: { type: DataTypes.INTEGER, allowNull: false },
    /** The customer may take none of the group's lines. */
    group_optional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    label: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    recommended: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    estimate_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimates', key: 'id' }, onDelete: 'RESTRICT' },
    piece_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'pieces', key: 'id' }, onDelete: 'RESTRICT' },
    revision_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'estimate_revisions', key: 'id' }, onDelete: 'RESTRICT' },
    /** The line's priced breakdown as quoted (the quote's discount and deposit). */
    pricing: { type: DataTypes.JSONB, allowNull: false },
    total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
    /** Set at acceptance: taken or not. Null before. */
    chosen: { type: DataTypes.BOOLEAN, allowNull: true },
    /** Chosen in an accepted quote: the piece's one agreement. */
    agreed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await queryInterface.addIndex('quote_lines', ['quote_id', 'position'], { name: 'quote_lines_position', unique: true });
  await queryInterface.addIndex('quote_lines', ['estimate_id'], { name: 'quote_lines_estimate' });
  await sequelize.query(`CREATE UNIQUE INDEX quote_lines_one_agreement ON quote_lines (piece_id) WHERE agreed`);
  await sequelize.query(`ALTER TABLE quote_lines ADD CONSTRAINT quote_lines_agreed_chosen CHECK (NOT agreed OR chosen)`);
  await sequelize.query(
    `INSERT INTO quote_lines (quote_id, position, option_group, group_optional, label, recommended, estimate_id, piece_id, revision_id, pricing, total, chosen, agreed, created_at)
     SELECT q.id, 1, 1, false, '', true, q.estimate_id, e.piece_id, q.revision_id, q.pricing, q.total,
            CASE WHEN q.accepted_at IS NOT NULL THEN true ELSE NULL END,
            q.state IN ('accepted', 'deposit-paid'), q.created_at
       FROM quotes q JOIN estimates e ON e.id = q.estimate_id`,
  );
  // The one agreement now sits on the pieces the lines name.
  await sequelize.query('DROP INDEX IF EXISTS quotes_one_agreement');

  await queryInterface.addColumn('jobs', 'quote_line_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'quote_lines', key: 'id' }, onDelete: 'RESTRICT' });
  await sequelize.query(`UPDATE jobs j SET quote_line_id = l.id FROM quote_lines l WHERE l.quote_id = j.quote_id AND l.position = 1`);
  await sequelize.query('ALTER TABLE jobs ALTER COLUMN quote_line_id SET NOT NULL');
  await sequelize.query('DROP INDEX IF EXISTS jobs_live_quote');
  await sequelize.query(`CREATE UNIQUE INDEX jobs_live_line ON jobs (quote_line_id) WHERE state <> 'cancelled'`);
  await sequelize.query('CREATE INDEX jobs_quote ON jobs (quote_id)');
}

export async function down({ queryInterface, sequelize }: MigrationContext): Promise<void> {
  const many = await sequelize.query<{ quote_id: number }>(
    `SELECT quote_id FROM jobs WHERE state <> 'cancelled' GROUP BY quote_id HAVING count(*) > 1`,
    { type: QueryTypes.SELECT },
  );
  if (many.length > 0) {
    throw new Error(`Quotes with more than one live job (ids ${many.map((r) => r.quote_id).join(', ')}): a quote of several pieces cannot go back to one job a quote.`);
  }
  const agreedTwice = await sequelize.query<{ estimate_id: number }>(
    `SELECT estimate_id FROM quotes WHERE state IN ('accepted', 'deposit-paid') GROUP BY estimate_id HAVING count(*) > 1`,
    { type: QueryTypes.SELECT },
  );
  if (agreedTwice.length > 0) {
    throw new Error(`Estimates named first by more than one accepted quote (ids ${agreedTwice.map((r) => r.estimate_id).join(', ')}): cannot restore one agreement per quote's estimate.`);
  }
  await sequelize.query('DROP INDEX IF EXISTS jobs_quote');
  await sequelize.query('DROP INDEX IF EXISTS jobs_live_line');
  await sequelize.query(`CREATE UNIQUE INDEX jobs_live_quote ON jobs (quote_id) WHERE state <> 'cancelled'`);
  await queryInterface.removeColumn('jobs', 'quote_line_id');
  await sequelize.query(`CREATE UNIQUE INDEX quotes_one_agreement ON quotes (estimate_id) WHERE state IN ('accepted', 'deposit-paid')`);
  // A quote keeps its first estimate and revision; the other lines and the choice between options go.
  await queryInterface.dropTable('quote_lines');
}
