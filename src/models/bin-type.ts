import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** A model of bin: capacity, masses, dimensions erected and folded, UN code and inspection policy. */
export class BinType extends Model<InferAttributes<BinType>, InferCreationAttributes<BinType>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare graiAssetType: string;
  declare nominalCapacityL: number;
  declare tareKg: string;
  declare maxGrossKg: string;
  declare footprintLengthMm: number;
  declare footprintWidthMm: number;
  declare heightErectedMm: number;
  declare heightFoldedMm: number;
  declare unCode: string | null;
  declare policyKind: CreationOptional<'un' | 'own'>;
  declare intermediateMonths: CreationOptional<number>;
  declare fullMonths: CreationOptional<number>;
  /** ADR 4.1.1.15 period of use of a rigid plastics inner receptacle: applies to this type, and its years. */
  declare serviceLifeApplies: CreationOptional<boolean>;
  declare serviceLifeYears: CreationOptional<number>;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

BinType.init(
  {
    id: idColumn,
    code: { type: DataTypes.STRING(24), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    graiAssetType: { type: DataTypes.STRING(6), allowNull: false },
    nominalCapacityL: { type: DataTypes.INTEGER, allowNull: false },
    tareKg: { type: DataTypes.DECIMAL(7, 1), allowNull: false },
    maxGrossKg: { type: DataTypes.DECIMAL(7, 1), allowNull: false },
    footprintLengthMm: { type: DataTypes.INTEGER, allowNull: false },
    footprintWidthMm: { type: DataTypes.INTEGER, allowNull: false },
    heightErectedMm: { type: DataTypes.INTEGER, allowNull: false },
    heightFoldedMm: { type: DataTypes.INTEGER, allowNull: false },
    unCode: { type: DataTypes.STRING(8), allowNull: true },
    policyKind: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'un' },
    intermediateMonths: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 30 },
    fullMonths: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 60 },
    serviceLifeApplies: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    serviceLifeYears: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 5 },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'bin_types', version: true },
);
