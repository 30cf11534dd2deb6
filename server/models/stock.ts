import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { MovementKind, PurchaseOrderState } from '@shared/schemas/stock';

/** One change to stock on hand, with the balance after it. */
export class StockMovement extends Model<InferAttributes<StockMovement>, InferCreationAttributes<StockMovement>> {
  declare id: CreationOptional<number>;
  declare materialId: number;
  declare packId: number | null;
  declare kind: MovementKind;
  /** NUMERIC: strings from the driver. */
  declare quantity: string;
  declare packs: string | null;
  declare balanceAfter: string;
  declare packPrice: string | null;
  declare value: string | null;
  declare reason: string | null;
  declare jobId: number | null;
  declare sessionId: number | null;
  declare orderId: number | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    StockMovement.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        materialId: { type: DataTypes.INTEGER, allowNull: false },
        packId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.STRING(10), allowNull: false },
        quantity: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        packs: { type: DataTypes.DECIMAL(12, 3), allowNull: true },
        balanceAfter: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        packPrice: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
        value: { type: DataTypes.DECIMAL(12, 2), allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: true },
        jobId: { type: DataTypes.INTEGER, allowNull: true },
        sessionId: { type: DataTypes.INTEGER, allowNull: true },
        orderId: { type: DataTypes.INTEGER, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'stock_movements', underscored: true, updatedAt: false },
    );
  }
}

export class PurchaseOrder extends Model<InferAttributes<PurchaseOrder>, InferCreationAttributes<PurchaseOrder>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare supplier: string;
  declare state: CreationOptional<PurchaseOrderState>;
  declare currency: string;
  declare total: string;
  declare expectedOn: string | null;
  declare note: CreationOptional<string>;
  declare sentTo: string | null;
  declare sentAt: Date | null;
  declare outboxId: number | null;
  declare receivedAt: Date | null;
  declare cancelledAt: Date | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare lines?: NonAttribute<PurchaseOrderLine[]>;

  static initModel(sequelize: Sequelize): void {
    PurchaseOrder.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        supplier: { type: DataTypes.STRING(120), allowNull: false },
        state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        total: { type: DataTypes.DECIMAL(12, 2), allowNull: false },
        expectedOn: { type: DataTypes.DATEONLY, allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        sentTo: { type: DataTypes.STRING(254), allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        outboxId: { type: DataTypes.INTEGER, allowNull: true },
        receivedAt: { type: DataTypes.DATE, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'purchase_orders', underscored: true },
    );
  }
}

export class PurchaseOrderLine extends Model<InferAttributes<PurchaseOrderLine>, InferCreationAttributes<PurchaseOrderLine>> {
  declare id: CreationOptional<number>;
  declare orderId: number;
  declare materialId: number;
  declare packId: number;
  declare packs: number;
  declare packSize: string;
  declare packPrice: string;
  declare receivedPacks: number | null;
  declare paidPrice: string | null;

  static initModel(sequelize: Sequelize): void {
    PurchaseOrderLine.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        orderId: { type: DataTypes.INTEGER, allowNull: false },
        materialId: { type: DataTypes.INTEGER, allowNull: false },
        packId: { type: DataTypes.INTEGER, allowNull: false },
        packs: { type: DataTypes.INTEGER, allowNull: false },
        packSize: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        packPrice: { type: DataTypes.DECIMAL(12, 4), allowNull: false },
        receivedPacks: { type: DataTypes.INTEGER, allowNull: true },
        paidPrice: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
      },
      { sequelize, tableName: 'purchase_order_lines', underscored: true, timestamps: false },
    );
  }
}

export function associateStock(): void {
  PurchaseOrder.hasMany(PurchaseOrderLine, { foreignKey: 'orderId', as: 'lines' });
  PurchaseOrderLine.belongsTo(PurchaseOrder, { foreignKey: 'orderId', as: 'order' });
}
