import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { PriceFilePreview as PreviewDto } from '@shared/schemas/price-list';

/** A parsed supplier price file waiting for the owner's confirmation. */
export class PriceFilePreview extends Model<InferAttributes<PriceFilePreview>, InferCreationAttributes<PriceFilePreview>> {
  declare id: string;
  declare userId: number | null;
  declare fileName: string;
  declare contentHash: string;
  declare preview: Omit<PreviewDto, 'id' | 'expiresAt' | 'appliedAt'>;
  declare createdAt: CreationOptional<Date>;
  declare expiresAt: Date;
  declare appliedAt: Date | null;

  static initModel(sequelize: Sequelize): void {
    PriceFilePreview.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        fileName: { type: DataTypes.STRING(200), allowNull: false },
        contentHash: { type: DataTypes.STRING(64), allowNull: false },
        preview: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        appliedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'price_file_previews', underscored: true, updatedAt: false },
    );
  }
}
