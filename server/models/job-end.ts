import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { VariationState } from '@shared/schemas/job-end';

/** A staff note on a job, with its author and time. Never shown to the customer. */
export class JobNote extends Model<InferAttributes<JobNote>, InferCreationAttributes<JobNote>> {
  declare id: CreationOptional<number>;
  declare jobId: number;
  declare authorId: number | null;
  declare body: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    JobNote.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        jobId: { type: DataTypes.INTEGER, allowNull: false },
        authorId: { type: DataTypes.INTEGER, allowNull: true },
        body: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'job_notes', underscored: true, updatedAt: false },
    );
  }
}

/** Something that happened to a job that the customer may hear of (dates changed, ready, a variation answered). */
export class JobEvent extends Model<InferAttributes<JobEvent>, InferCreationAttributes<JobEvent>> {
  declare id: CreationOptional<number>;
  declare jobId: number;
  declare kind: string;
  declare detail: Record<string, unknown>;
  declare actorId: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    JobEvent.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        jobId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(40), allowNull: false },
        detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'job_events', underscored: true, updatedAt: false },
    );
  }
}

/** Work found during a job, priced by the engine or by hand, approved or declined by the customer. */
export class JobVariation extends Model<InferAttributes<JobVariation>, InferCreationAttributes<JobVariation>> {
  declare id: CreationOptional<number>;
  declare jobId: number;
  declare quoteId: number;
  declare title: string;
  declare description: CreationOptional<string>;
  declare pricedBy: 'engine' | 'hand';
  /** NUMERIC: a string from the driver. */
  declare price: string;
  declare hours: string;
  declare working: Record<string, unknown> | null;
  declare state: CreationOptional<VariationState>;
  declare tokenHash: CreationOptional<string | null>;
  declare sentAt: CreationOptional<Date | null>;
  declare answeredAt: CreationOptional<Date | null>;
  declare answerNote: CreationOptional<string | null>;
  declare answerIp: CreationOptional<string | null>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    JobVariation.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        jobId: { type: DataTypes.INTEGER, allowNull: false },
        quoteId: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        pricedBy: { type: DataTypes.STRING(8), allowNull: false },
        price: { type: DataTypes.DECIMAL(12, 2), allowNull: false },
        hours: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        working: { type: DataTypes.JSONB, allowNull: true },
        state: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'draft' },
        tokenHash: { type: DataTypes.STRING(64), allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        answeredAt: { type: DataTypes.DATE, allowNull: true },
        answerNote: { type: DataTypes.STRING(500), allowNull: true },
        answerIp: { type: DataTypes.STRING(64), allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'job_variations', underscored: true },
    );
  }
}
