import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { WhyNot } from '@shared/calc/planning';
import type { JobStageKind, JobState, OverbookingDto } from '@shared/schemas/planning';
import type { JobCustody, KeepScope } from '@shared/schemas/job-end';

const stamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

/** A polisher and the hands-on hours they give on an open day. */
export class Polisher extends Model<InferAttributes<Polisher>, InferCreationAttributes<Polisher>> {
  declare id: CreationOptional<number>;
  declare name: string;
  /** NUMERIC: a string from the driver. */
  declare hoursPerDay: string | number;
  declare daysOff: string[];
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Polisher.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        hoursPerDay: { type: DataTypes.DECIMAL(4, 2), allowNull: false },
        daysOff: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        ...stamps,
      },
      { sequelize, tableName: 'polishers', underscored: true },
    );
  }
}

/** A stage as quoted: hours and materials (flakes and spirit folded in under their material keys). */
export interface JobStage {
  key: string;
  kind: JobStageKind;
  name: string;
  sessions: number;
  labourHours: number;
  materials: { material: string; quantity: number; unit: string }[];
}

export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare quoteId: number;
  declare quoteLineId: number;
  declare estimateId: number;
  declare revisionId: number;
  declare customerId: number;
  declare title: string;
  declare state: CreationOptional<JobState>;
  declare bays: CreationOptional<number>;
  declare areaM2: string | number;
  declare stages: JobStage[];
  declare notes: CreationOptional<string>;
  declare roomStart: string | null;
  declare roomEnd: string | null;
  declare startMode: 'earliest' | 'date' | null;
  declare forced: CreationOptional<boolean>;
  declare overbooking: OverbookingDto | null;
  declare whyNotSooner: CreationOptional<WhyNot[]>;
  declare bookedAt: Date | null;
  declare bookedBy: number | null;
  declare finishedAt: Date | null;
  declare cancelledAt: Date | null;
  declare createdBy: number | null;
  /** Where the piece is: awaiting collection, in the workshop, ready, returned (moves by JOB_CUSTODY_MOVES). */
  declare custody: CreationOptional<JobCustody>;
  declare collectionDate: CreationOptional<string | null>;
  declare collectionArrangement: CreationOptional<string>;
  declare returnDate: CreationOptional<string | null>;
  declare returnArrangement: CreationOptional<string>;
  declare collectedOn: CreationOptional<string | null>;
  declare completedOn: CreationOptional<string | null>;
  declare returnedOn: CreationOptional<string | null>;
  /** The hand kept on the job (every session) or on its bodying (first bodying to spiriting off). */
  declare keptPolisherId: CreationOptional<number | null>;
  declare keepScope: CreationOptional<KeepScope | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare sessions?: NonAttribute<JobSession[]>;

  static initModel(sequelize: Sequelize): void {
    Job.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        quoteId: { type: DataTypes.INTEGER, allowNull: false },
        quoteLineId: { type: DataTypes.INTEGER, allowNull: false },
        estimateId: { type: DataTypes.INTEGER, allowNull: false },
        revisionId: { type: DataTypes.INTEGER, allowNull: false },
        customerId: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.STRING(200), allowNull: false },
        state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'unbooked' },
        bays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        areaM2: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        stages: { type: DataTypes.JSONB, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        roomStart: { type: DataTypes.STRING(16), allowNull: true },
        roomEnd: { type: DataTypes.STRING(16), allowNull: true },
        startMode: { type: DataTypes.STRING(10), allowNull: true },
        forced: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        overbooking: { type: DataTypes.JSONB, allowNull: true },
        whyNotSooner: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        bookedAt: { type: DataTypes.DATE, allowNull: true },
        bookedBy: { type: DataTypes.INTEGER, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        custody: { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'awaiting-collection' },
        collectionDate: { type: DataTypes.DATEONLY, allowNull: true },
        collectionArrangement: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        returnDate: { type: DataTypes.DATEONLY, allowNull: true },
        returnArrangement: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        collectedOn: { type: DataTypes.DATEONLY, allowNull: true },
        completedOn: { type: DataTypes.DATEONLY, allowNull: true },
        returnedOn: { type: DataTypes.DATEONLY, allowNull: true },
        keptPolisherId: { type: DataTypes.INTEGER, allowNull: true },
        keepScope: { type: DataTypes.STRING(10), allowNull: true },
        ...stamps,
      },
      { sequelize, tableName: 'jobs', underscored: true },
    );
  }
}

/** One session of a job: its plan, and once done, what actually happened. */
export class JobSession extends Model<InferAttributes<JobSession>, InferCreationAttributes<JobSession>> {
  declare id: CreationOptional<number>;
  declare jobId: number;
  declare idx: number;
  declare stage: string;
  declare stageKind: JobStageKind;
  declare stageName: string;
  declare session: number;
  declare ofSessions: number;
  declare handsOnMin: number;
  declare restMin: number;
  declare estimatedHours: string | number;
  declare plannedStart: string | null;
  declare plannedEnd: string | null;
  declare restUntil: string | null;
  declare segments: CreationOptional<{ start: string; end: string }[]>;
  declare baselineStart: string | null;
  declare baselineEnd: string | null;
  declare polisherId: number | null;
  declare done: CreationOptional<boolean>;
  declare actualEnd: string | null;
  declare actualHours: string | number | null;
  declare temperatureC: string | number | null;
  declare humidityPct: string | number | null;
  declare notes: string | null;
  declare materialsUsed: CreationOptional<string | null>;
  declare problem: CreationOptional<string | null>;
  declare doneBy: number | null;
  declare doneAt: Date | null;

  static initModel(sequelize: Sequelize): void {
    JobSession.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        jobId: { type: DataTypes.INTEGER, allowNull: false },
        idx: { type: DataTypes.INTEGER, allowNull: false },
        stage: { type: DataTypes.STRING(64), allowNull: false },
        stageKind: { type: DataTypes.STRING(16), allowNull: false },
        stageName: { type: DataTypes.STRING(80), allowNull: false },
        session: { type: DataTypes.INTEGER, allowNull: false },
        ofSessions: { type: DataTypes.INTEGER, allowNull: false },
        handsOnMin: { type: DataTypes.INTEGER, allowNull: false },
        restMin: { type: DataTypes.INTEGER, allowNull: false },
        estimatedHours: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
        plannedStart: { type: DataTypes.STRING(16), allowNull: true },
        plannedEnd: { type: DataTypes.STRING(16), allowNull: true },
        restUntil: { type: DataTypes.STRING(16), allowNull: true },
        segments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        baselineStart: { type: DataTypes.STRING(16), allowNull: true },
        baselineEnd: { type: DataTypes.STRING(16), allowNull: true },
        polisherId: { type: DataTypes.INTEGER, allowNull: true },
        done: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        actualEnd: { type: DataTypes.STRING(16), allowNull: true },
        actualHours: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
        temperatureC: { type: DataTypes.DECIMAL(4, 1), allowNull: true },
        humidityPct: { type: DataTypes.DECIMAL(4, 1), allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        materialsUsed: { type: DataTypes.TEXT, allowNull: true },
        problem: { type: DataTypes.TEXT, allowNull: true },
        doneBy: { type: DataTypes.INTEGER, allowNull: true },
        doneAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'job_sessions', underscored: true, timestamps: false },
    );
  }
}

/** Stock on hand of one material, in its own unit. */
export class MaterialStock extends Model<InferAttributes<MaterialStock>, InferCreationAttributes<MaterialStock>> {
  declare materialId: number;
  declare quantity: string | number;
  declare updatedBy: number | null;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    MaterialStock.init(
      {
        materialId: { type: DataTypes.INTEGER, primaryKey: true },
        quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false, defaultValue: 0 },
        updatedBy: { type: DataTypes.INTEGER, allowNull: true },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'material_stock', underscored: true, createdAt: false },
    );
  }
}

export function associatePlanning(): void {
  Job.hasMany(JobSession, { foreignKey: 'jobId', as: 'sessions' });
}
