import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';
import type { ValveType } from '@/lib/liners/liner-specs';

/** What a liner is: material, capacity, valve and gland, grade, the supplier's article. Bin types list the specs that fit them. */
export class LinerSpec extends Model<InferAttributes<LinerSpec>, InferCreationAttributes<LinerSpec>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare material: string;
  declare layers: number;
  declare nominalCapacityL: number;
  declare valveType: ValveType;
  declare valveSize: string | null;
  declare glandSize: string;
  declare foodContact: boolean;
  declare maxFillTempC: number | null;
  declare supplierId: number | null;
  declare articleNumber: string | null;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

LinerSpec.init(
  {
    id: idColumn,
    code: { type: DataTypes.STRING(24), allowNull: false },
    name: { type: DataTypes.STRING(160), allowNull: false },
    material: { type: DataTypes.STRING(60), allowNull: false },
    layers: { type: DataTypes.SMALLINT, allowNull: false },
    nominalCapacityL: { type: DataTypes.INTEGER, allowNull: false },
    valveType: { type: DataTypes.STRING(12), allowNull: false },
    valveSize: { type: DataTypes.STRING(12), allowNull: true },
    glandSize: { type: DataTypes.STRING(12), allowNull: false },
    foodContact: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    maxFillTempC: { type: DataTypes.SMALLINT, allowNull: true },
    supplierId: { type: DataTypes.INTEGER, allowNull: true },
    articleNumber: { type: DataTypes.STRING(40), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'liner_specs', version: true },
);
