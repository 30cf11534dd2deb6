import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Workshop as WorkshopDto, WorkshopSettings } from '@shared/schemas/workshop';

export class Workshop extends Model<InferAttributes<Workshop>, InferCreationAttributes<Workshop>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare email: string | null;
  declare phone: string | null;
  declare address: string | null;
  declare settings: WorkshopSettings;
  /** The workshop's own account with the payment provider (a connected account), and how far its set-up has gone. */
  declare paymentAccountId: CreationOptional<string | null>;
  declare paymentAccountState: CreationOptional<'none' | 'onboarding' | 'ready'>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  toDto(): WorkshopDto {
    return {
      id: this.id,
      name: this.name,
      email: this.email,
      phone: this.phone,
      address: this.address,
      settings: this.settings,
    };
  }

  static initModel(sequelize: Sequelize): void {
    Workshop.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: true },
        phone: { type: DataTypes.STRING(40), allowNull: true },
        address: { type: DataTypes.TEXT, allowNull: true },
        settings: { type: DataTypes.JSONB, allowNull: false },
        paymentAccountId: { type: DataTypes.STRING(120), allowNull: true },
        paymentAccountState: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'none' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'workshops', underscored: true },
    );
  }
}
