import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/**
 * A customer's hire terms for a period (both ends included; no end = until
 * further notice). Orders and billing read the tariff in force on a day; a
 * customer's tariffs never overlap (exclusion constraint).
 */
export class Tariff extends Model<InferAttributes<Tariff>, InferCreationAttributes<Tariff>> {
  declare id: CreationOptional<number>;
  declare customerId: number;
  declare freeDays: number;
  declare dailyRate: string;
  declare perTripFee: string;
  declare lostBinFee: string;
  declare currency: string;
  declare validFrom: string;
  declare validTo: string | null;
  /** Which ends of a hire count, and the events that start and stop it (the billing rule's day count). */
  declare firstDayCounts: CreationOptional<boolean>;
  declare lastDayCounts: CreationOptional<boolean>;
  declare hireStartsAt: CreationOptional<'dispatch' | 'delivery'>;
  declare hireStopsAt: CreationOptional<'ready_notice' | 'collection' | 'depot_receipt'>;
  declare linerFee: CreationOptional<string>;
  /** Charged per stop of a finished collection run at one of the customer's sites. */
  declare stopFee: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Tariff.init(
  {
    id: idColumn,
    customerId: { type: DataTypes.INTEGER, allowNull: false },
    freeDays: { type: DataTypes.INTEGER, allowNull: false },
    dailyRate: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    perTripFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    lostBinFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    validFrom: { type: DataTypes.DATEONLY, allowNull: false },
    validTo: { type: DataTypes.DATEONLY, allowNull: true },
    firstDayCounts: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    lastDayCounts: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    hireStartsAt: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'delivery' },
    hireStopsAt: { type: DataTypes.STRING(14), allowNull: false, defaultValue: 'collection' },
    linerFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: '0' },
    stopFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: '0' },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'tariffs', version: true },
);
