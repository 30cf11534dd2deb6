import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<string>;
  declare at: CreationOptional<Date>;
  declare userId: number | null;
  declare action: string;
  declare entityType: string;
  declare entityId: string | null;
  declare before: unknown;
  declare after: unknown;

  static initModel(sequelize: Sequelize): void {
    AuditEntry.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        action: { type: DataTypes.STRING(60), allowNull: false },
        entityType: { type: DataTypes.STRING(60), allowNull: false },
        entityId: { type: DataTypes.STRING(60), allowNull: true },
        before: { type: DataTypes.JSONB, allowNull: true },
        after: { type: DataTypes.JSONB, allowNull: true },
      },
      { sequelize, tableName: 'audit_log', underscored: true, timestamps: false },
    );
  }
}
