import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Role, User as UserDto } from '@shared/schemas/auth';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare passwordHash: string;
  declare active: CreationOptional<boolean>;
  /** Filled by the database from the workshop the insert runs under (row-level security). */
  declare workshopId: CreationOptional<number>;
  declare lastLoginAt: Date | null;
  /** When the address was confirmed; null only for a sign-up whose link has not been opened (it cannot sign in). */
  declare emailConfirmedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  /** What leaves the server: never the password hash. */
  toDto(): UserDto {
    return {
      id: this.id,
      email: this.email,
      name: this.name,
      role: this.role,
      active: this.active,
      lastLoginAt: this.lastLoginAt ? this.lastLoginAt.toISOString() : null,
      createdAt: this.createdAt.toISOString(),
    };
  }

  static initModel(sequelize: Sequelize): void {
    User.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        email: { type: DataTypes.STRING(254), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        role: { type: DataTypes.STRING(20), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        workshopId: { type: DataTypes.INTEGER, allowNull: true },
        lastLoginAt: { type: DataTypes.DATE, allowNull: true },
        // The column's DEFAULT (now()) confirms users an owner adds; leaving the attribute out lets it apply.
        emailConfirmedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', underscored: true },
    );
  }
}
