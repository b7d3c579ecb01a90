import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { RunStatus } from '@/lib/planning/run-status';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** One truck collecting empties from customer sites for a depot: planned → confirmed → done, or cancelled. */
export class TruckRun extends Model<InferAttributes<TruckRun>, InferCreationAttributes<TruckRun>> {
  declare id: CreationOptional<number>;
  declare reference: string;
  /** The depot the bins are brought back to (and received at). */
  declare depotSiteId: number;
  declare trailerId: number | null;
  declare binTypeId: number | null;
  declare carrier: string | null;
  declare plannedOn: string;
  declare status: CreationOptional<RunStatus>;
  declare roadKm: number | null;
  declare createdBy: number | null;
  declare confirmedAt: Date | null;
  declare finishedAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

TruckRun.init(
  {
    id: idColumn,
    reference: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    depotSiteId: { type: DataTypes.INTEGER, allowNull: false },
    trailerId: { type: DataTypes.INTEGER, allowNull: true },
    binTypeId: { type: DataTypes.INTEGER, allowNull: true },
    carrier: { type: DataTypes.STRING(120), allowNull: true },
    plannedOn: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'planned' },
    roadKm: { type: DataTypes.INTEGER, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    confirmedAt: { type: DataTypes.DATE, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'truck_runs', version: true },
);

/** A stop of a run, in driving order: the site and the bins expected there. */
export class TruckRunStop extends Model<InferAttributes<TruckRunStop>, InferCreationAttributes<TruckRunStop>> {
  declare id: CreationOptional<number>;
  declare runId: number;
  declare position: number;
  declare siteId: number;
  declare expectedBins: number;
}

TruckRunStop.init(
  {
    id: idColumn,
    runId: { type: DataTypes.INTEGER, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    siteId: { type: DataTypes.INTEGER, allowNull: false },
    expectedBins: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: 'truck_run_stops', timestamps: false },
);
