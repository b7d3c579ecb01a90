import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';
import type { Status, Leg } from '@/lib/scans/lifecycle';

/**
 * A bin, identified by its GS1 GRAI. The current-state columns (status, site,
 * customer, trip, leg, liner, last scan) are derived from the scan-event log
 * inside each scan's transaction, so grids sort and filter on indexed columns.
 */
export class Asset extends Model<InferAttributes<Asset>, InferCreationAttributes<Asset>> {
  declare id: CreationOptional<number>;
  declare grai: string;
  declare serial: string;
  declare binTypeId: number;
  declare manufactureMonth: string;
  declare unMarking: string | null;
  declare status: Status;
  declare siteId: number | null;
  declare siteSince: Date | null;
  declare customerId: number | null;
  declare currentTripId: number | null;
  declare leg: Leg | null;
  declare prepChecked: CreationOptional<boolean>;
  declare linerLotId: number | null;
  declare filled: CreationOptional<boolean>;
  declare lastScanAt: Date | null;
  declare tripCount: CreationOptional<number>;
  declare lastInspectionOn: string | null;
  /** Last inspection done with a leakproofness test: the 2.5-year clock runs from it. */
  declare lastLeakTestOn: string | null;
  /** Month the rigid plastics inner receptacle was made (ADR 4.1.1.15), for types the rule applies to. */
  declare innerMadeMonth: CreationOptional<string | null>;
  declare lastFullInspectionOn: string | null;
  declare nextIntermediateDue: string | null;
  declare nextFullDue: string | null;
  declare nextDue: string | null;
  declare labelPrintedAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Asset.init(
  {
    id: idColumn,
    grai: { type: DataTypes.STRING(30), allowNull: false, unique: true },
    serial: { type: DataTypes.STRING(16), allowNull: false },
    binTypeId: { type: DataTypes.INTEGER, allowNull: false },
    manufactureMonth: { type: DataTypes.DATEONLY, allowNull: false },
    unMarking: { type: DataTypes.STRING(120), allowNull: true },
    status: { type: DataTypes.STRING(24), allowNull: false },
    siteId: { type: DataTypes.INTEGER, allowNull: true },
    siteSince: { type: DataTypes.DATE, allowNull: true },
    customerId: { type: DataTypes.INTEGER, allowNull: true },
    currentTripId: { type: DataTypes.INTEGER, allowNull: true },
    leg: { type: DataTypes.STRING(10), allowNull: true },
    prepChecked: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    linerLotId: { type: DataTypes.INTEGER, allowNull: true },
    filled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    lastScanAt: { type: DataTypes.DATE, allowNull: true },
    tripCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    lastInspectionOn: { type: DataTypes.DATEONLY, allowNull: true },
    lastLeakTestOn: { type: DataTypes.DATEONLY, allowNull: true },
    innerMadeMonth: { type: DataTypes.DATEONLY, allowNull: true },
    lastFullInspectionOn: { type: DataTypes.DATEONLY, allowNull: true },
    nextIntermediateDue: { type: DataTypes.DATEONLY, allowNull: true },
    nextFullDue: { type: DataTypes.DATEONLY, allowNull: true },
    nextDue: { type: DataTypes.DATEONLY, allowNull: true },
    labelPrintedAt: { type: DataTypes.DATE, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'assets', version: true },
);
