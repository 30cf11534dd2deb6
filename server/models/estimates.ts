import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Catalog } from '@shared/schemas/catalog';
import type { EstimateResult, ParsedEstimateInput } from '@shared/schemas/calc';
import type { PieceKind } from '@shared/schemas/customers';
import type { EstimateState } from '@shared/schemas/estimates';
import type { User } from './user';

const stamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

export class Customer extends Model<InferAttributes<Customer>, InferCreationAttributes<Customer>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare email: string | null;
  declare phone: string | null;
  declare address: string | null;
  declare notes: string | null;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Customer.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: true },
        phone: { type: DataTypes.STRING(40), allowNull: true },
        address: { type: DataTypes.STRING(500), allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'customers', underscored: true },
    );
  }
}

export class Piece extends Model<InferAttributes<Piece>, InferCreationAttributes<Piece>> {
  declare id: CreationOptional<number>;
  declare customerId: ForeignKey<Customer['id']>;
  declare kind: PieceKind;
  declare description: string;
  declare maker: string | null;
  declare year: number | null;
  /** The year as written ("c. 1830", "1890s"); `year` is its sortable best guess. */
  declare yearText: string | null;
  declare serial: string | null;
  declare dimensions: Record<string, string>;
  declare conditionNotes: string | null;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare customer?: NonAttribute<Customer>;
  declare photos?: NonAttribute<PiecePhoto[]>;

  static initModel(sequelize: Sequelize): void {
    Piece.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false },
        maker: { type: DataTypes.STRING(120), allowNull: true },
        year: { type: DataTypes.INTEGER, allowNull: true },
        yearText: { type: DataTypes.STRING(40), allowNull: true },
        serial: { type: DataTypes.STRING(60), allowNull: true },
        dimensions: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        conditionNotes: { type: DataTypes.TEXT, allowNull: true },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'pieces', underscored: true },
    );
  }
}

export class PiecePhoto extends Model<InferAttributes<PiecePhoto>, InferCreationAttributes<PiecePhoto>> {
  declare id: CreationOptional<number>;
  declare pieceId: ForeignKey<Piece['id']>;
  declare fileName: string;
  declare thumbName: string;
  /** The bounded working copy (JPEG) that pages and PDFs use; null for a photo stored before there were any. */
  declare workName: CreationOptional<string | null>;
  declare mime: string;
  declare bytes: number;
  declare width: number;
  declare height: number;
  declare caption: CreationOptional<string>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  /** A progress photo: the job it was taken for, before/during/after, and whether the customer's page shows it. */
  declare jobId: CreationOptional<number | null>;
  declare phase: CreationOptional<'before' | 'during' | 'after' | null>;
  declare shared: CreationOptional<boolean>;

  static initModel(sequelize: Sequelize): void {
    PiecePhoto.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        fileName: { type: DataTypes.STRING(80), allowNull: false },
        thumbName: { type: DataTypes.STRING(80), allowNull: false },
        workName: { type: DataTypes.STRING(80), allowNull: true },
        mime: { type: DataTypes.STRING(40), allowNull: false },
        bytes: { type: DataTypes.INTEGER, allowNull: false },
        width: { type: DataTypes.INTEGER, allowNull: false },
        height: { type: DataTypes.INTEGER, allowNull: false },
        caption: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        jobId: { type: DataTypes.INTEGER, allowNull: true },
        phase: { type: DataTypes.STRING(8), allowNull: true },
        shared: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      },
      { sequelize, tableName: 'piece_photos', underscored: true, updatedAt: false },
    );
  }
}

export class Estimate extends Model<InferAttributes<Estimate>, InferCreationAttributes<Estimate>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare customerId: ForeignKey<Customer['id']>;
  declare pieceId: ForeignKey<Piece['id']>;
  declare ownerId: ForeignKey<User['id']>;
  declare title: string;
  declare state: CreationOptional<EstimateState>;
  declare validUntil: string;
  declare revisionCount: CreationOptional<number>;
  declare currentRevisionId: number | null;
  /** NUMERIC: decimal strings. */
  declare total: CreationOptional<string>;
  declare labourHours: CreationOptional<string>;
  declare currency: string;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare customer?: NonAttribute<Customer>;
  declare piece?: NonAttribute<Piece>;
  declare owner?: NonAttribute<User>;

  static initModel(sequelize: Sequelize): void {
    Estimate.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        title: { type: DataTypes.STRING(160), allowNull: false },
        state: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
        validUntil: { type: DataTypes.DATEONLY, allowNull: false },
        revisionCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        currentRevisionId: { type: DataTypes.INTEGER, allowNull: true },
        total: { type: DataTypes.DECIMAL(14, 2), allowNull: false, defaultValue: 0 },
        labourHours: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: 0 },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'estimates', underscored: true },
    );
  }
}

export class EstimateRevision extends Model<InferAttributes<EstimateRevision>, InferCreationAttributes<EstimateRevision>> {
  declare id: CreationOptional<number>;
  declare estimateId: ForeignKey<Estimate['id']>;
  declare number: number;
  declare input: ParsedEstimateInput;
  declare result: EstimateResult;
  declare catalogVersion: string;
  declare catalog: Catalog;
  declare total: string;
  declare labourHours: string;
  declare note: CreationOptional<string>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare author?: NonAttribute<User>;

  static initModel(sequelize: Sequelize): void {
    EstimateRevision.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.INTEGER, allowNull: false },
        input: { type: DataTypes.JSONB, allowNull: false },
        result: { type: DataTypes.JSONB, allowNull: false },
        catalogVersion: { type: DataTypes.STRING(40), allowNull: false },
        catalog: { type: DataTypes.JSONB, allowNull: false },
        total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        labourHours: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
        note: { type: DataTypes.STRING(1000), allowNull: false, defaultValue: '' },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'estimate_revisions', underscored: true, updatedAt: false },
    );
  }
}

export function associateEstimates(UserModel: typeof User): void {
  Customer.hasMany(Piece, { as: 'pieces', foreignKey: 'customerId' });
  Piece.belongsTo(Customer, { as: 'customer', foreignKey: 'customerId' });
  Piece.hasMany(PiecePhoto, { as: 'photos', foreignKey: 'pieceId' });
  PiecePhoto.belongsTo(Piece, { as: 'piece', foreignKey: 'pieceId' });
  Estimate.belongsTo(Customer, { as: 'customer', foreignKey: 'customerId' });
  Estimate.belongsTo(Piece, { as: 'piece', foreignKey: 'pieceId' });
  Estimate.belongsTo(UserModel, { as: 'owner', foreignKey: 'ownerId' });
  Estimate.hasMany(EstimateRevision, { as: 'revisions', foreignKey: 'estimateId' });
  EstimateRevision.belongsTo(Estimate, { as: 'estimate', foreignKey: 'estimateId' });
  EstimateRevision.belongsTo(UserModel, { as: 'author', foreignKey: 'createdBy' });
}
