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
import type { MaterialUnit, Pores, Stage } from '@shared/schemas/catalog';

const stamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

export class Species extends Model<InferAttributes<Species>, InferCreationAttributes<Species>> {
  declare id: CreationOptional<number>;
  declare key: string;
  declare name: string;
  declare pores: Pores;
  declare needsGrainFill: boolean;
  /** NUMERIC: a string from the driver. */
  declare absorbency: string | number;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Species.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        pores: { type: DataTypes.STRING(12), allowNull: false },
        needsGrainFill: { type: DataTypes.BOOLEAN, allowNull: false },
        absorbency: { type: DataTypes.DECIMAL(6, 3), allowNull: false },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'species', underscored: true },
    );
  }
}

export class FinishingSystem extends Model<InferAttributes<FinishingSystem>, InferCreationAttributes<FinishingSystem>> {
  declare id: CreationOptional<number>;
  declare key: string;
  declare name: string;
  declare description: CreationOptional<string>;
  declare stages: Stage[];
  declare preset: CreationOptional<boolean>;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    FinishingSystem.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        description: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        stages: { type: DataTypes.JSONB, allowNull: false },
        preset: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'finishing_systems', underscored: true },
    );
  }
}

export class Material extends Model<InferAttributes<Material>, InferCreationAttributes<Material>> {
  declare id: CreationOptional<number>;
  declare key: string;
  declare name: string;
  declare kind: string;
  declare unit: MaterialUnit;
  declare notes: CreationOptional<string>;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare packs?: NonAttribute<MaterialPack[]>;

  static initModel(sequelize: Sequelize): void {
    Material.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        unit: { type: DataTypes.STRING(10), allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'materials', underscored: true },
    );
  }
}

export class MaterialPack extends Model<InferAttributes<MaterialPack>, InferCreationAttributes<MaterialPack>> {
  declare id: CreationOptional<number>;
  declare materialId: ForeignKey<Material['id']>;
  /** NUMERIC: a string from the driver. */
  declare size: string | number;
  declare label: CreationOptional<string>;
  declare supplier: CreationOptional<string>;
  declare supplierCode: string | null;
  declare archived: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare prices?: NonAttribute<PackPrice[]>;

  static initModel(sequelize: Sequelize): void {
    MaterialPack.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        size: { type: DataTypes.DECIMAL(14, 3), allowNull: false },
        label: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        supplier: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        supplierCode: { type: DataTypes.STRING(60), allowNull: true },
        archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...stamps,
      },
      { sequelize, tableName: 'material_packs', underscored: true },
    );
  }
}

export class PackPrice extends Model<InferAttributes<PackPrice>, InferCreationAttributes<PackPrice>> {
  declare id: CreationOptional<number>;
  declare packId: ForeignKey<MaterialPack['id']>;
  /** NUMERIC(12,4): a decimal string. */
  declare price: string;
  /** 'YYYY-MM-DD' */
  declare effectiveFrom: string;
  declare userId: number | null;
  declare source: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    PackPrice.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        price: { type: DataTypes.DECIMAL(12, 4), allowNull: false },
        effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        source: { type: DataTypes.STRING(120), allowNull: false, defaultValue: 'manual' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'pack_prices', underscored: true, updatedAt: false },
    );
  }
}

export class LabourRate extends Model<InferAttributes<LabourRate>, InferCreationAttributes<LabourRate>> {
  declare id: CreationOptional<number>;
  declare key: string;
  declare name: string;
  declare perHour: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    LabourRate.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        key: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        perHour: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
        ...stamps,
      },
      { sequelize, tableName: 'labour_rates', underscored: true },
    );
  }
}

export function associateCatalog(): void {
  Material.hasMany(MaterialPack, { as: 'packs', foreignKey: 'materialId' });
  MaterialPack.belongsTo(Material, { as: 'material', foreignKey: 'materialId' });
  MaterialPack.hasMany(PackPrice, { as: 'prices', foreignKey: 'packId' });
  PackPrice.belongsTo(MaterialPack, { as: 'pack', foreignKey: 'packId' });
}
