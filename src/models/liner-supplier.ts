import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** A liner supplier and its terms: the planning inputs (lead time, order cost, packs, minimum, price). */
export class LinerSupplier extends Model<InferAttributes<LinerSupplier>, InferCreationAttributes<LinerSupplier>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare orderEmail: string | null;
  declare leadTimeDays: number;
  declare orderCost: string;
  declare packSize: number;
  declare minOrderQty: number;
  declare pricePerLiner: string;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

LinerSupplier.init(
  {
    id: idColumn,
    name: { type: DataTypes.STRING(120), allowNull: false },
    orderEmail: { type: DataTypes.STRING(254), allowNull: true },
    leadTimeDays: { type: DataTypes.INTEGER, allowNull: false },
    orderCost: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    packSize: { type: DataTypes.INTEGER, allowNull: false },
    minOrderQty: { type: DataTypes.INTEGER, allowNull: false },
    pricePerLiner: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'liner_suppliers', version: true },
);
