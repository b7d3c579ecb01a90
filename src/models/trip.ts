import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** One rotation of one bin: opened at dispatch, closed when it is received back at a depot. */
export class Trip extends Model<InferAttributes<Trip>, InferCreationAttributes<Trip>> {
  declare id: CreationOptional<number>;
  declare assetId: number;
  declare hireOrderId: number | null;
  declare loadId: CreationOptional<number | null>;
  declare customerId: number;
  declare depotSiteId: number;
  declare customerSiteId: number | null;
  declare dischargeSiteId: number | null;
  declare closingSiteId: number | null;
  declare linerLotId: number | null;
  declare dispatchedAt: Date;
  declare deliveredAt: Date | null;
  declare filledAt: Date | null;
  declare dischargedAt: Date | null;
  declare collectedAt: Date | null;
  declare returnedAt: Date | null;
  declare fillProduct: string | null;
  declare fillVolumeL: string | null;
  declare fillMassKg: string | null;
  declare fillTemperatureC: string | null;
  declare sealsApplied: CreationOptional<string[]>;
  declare sealsVerified: CreationOptional<string[]>;
  declare sealMismatch: CreationOptional<boolean>;
  declare status: CreationOptional<'open' | 'closed'>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Trip.init(
  {
    id: idColumn,
    assetId: { type: DataTypes.INTEGER, allowNull: false },
    hireOrderId: { type: DataTypes.INTEGER, allowNull: true },
    loadId: { type: DataTypes.INTEGER, allowNull: true },
    customerId: { type: DataTypes.INTEGER, allowNull: false },
    depotSiteId: { type: DataTypes.INTEGER, allowNull: false },
    customerSiteId: { type: DataTypes.INTEGER, allowNull: true },
    dischargeSiteId: { type: DataTypes.INTEGER, allowNull: true },
    closingSiteId: { type: DataTypes.INTEGER, allowNull: true },
    linerLotId: { type: DataTypes.INTEGER, allowNull: true },
    dispatchedAt: { type: DataTypes.DATE, allowNull: false },
    deliveredAt: { type: DataTypes.DATE, allowNull: true },
    filledAt: { type: DataTypes.DATE, allowNull: true },
    dischargedAt: { type: DataTypes.DATE, allowNull: true },
    collectedAt: { type: DataTypes.DATE, allowNull: true },
    returnedAt: { type: DataTypes.DATE, allowNull: true },
    fillProduct: { type: DataTypes.STRING(120), allowNull: true },
    fillVolumeL: { type: DataTypes.DECIMAL(8, 1), allowNull: true },
    fillMassKg: { type: DataTypes.DECIMAL(8, 1), allowNull: true },
    fillTemperatureC: { type: DataTypes.DECIMAL(5, 1), allowNull: true },
    sealsApplied: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
    sealsVerified: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
    sealMismatch: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    status: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'open' },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'trips', version: true },
);
