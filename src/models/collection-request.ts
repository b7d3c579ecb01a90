import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** "Empties ready for collection" — from the public bin page, the customer portal or a planner. */
export class CollectionRequest extends Model<InferAttributes<CollectionRequest>, InferCreationAttributes<CollectionRequest>> {
  declare id: CreationOptional<number>;
  declare source: 'public' | 'portal' | 'planner';
  declare assetId: number | null;
  declare siteId: number | null;
  declare customerId: number | null;
  declare quantity: number;
  declare locationNote: string | null;
  declare contactName: string | null;
  declare contactPhone: string | null;
  declare contactEmail: string | null;
  declare note: string | null;
  /** The day the empties are ready (asked through the portal). */
  declare readyOn: CreationOptional<string | null>;
  /** The day the collection run is planned (set by the planner when scheduling). */
  declare plannedFor: CreationOptional<string | null>;
  /** The truck run that collects it (planning/truck-runs.server.ts). */
  declare truckRunId: CreationOptional<number | null>;
  declare status: CreationOptional<'open' | 'scheduled' | 'done' | 'cancelled'>;
  /** How many reports this request holds (same bin or site within the merge window) and when the latest came. */
  declare reportCount: CreationOptional<number>;
  declare lastReportedAt: CreationOptional<Date>;
  declare requestedBy: number | null;
  declare requesterIp: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

CollectionRequest.init(
  {
    id: idColumn,
    source: { type: DataTypes.STRING(10), allowNull: false },
    assetId: { type: DataTypes.INTEGER, allowNull: true },
    siteId: { type: DataTypes.INTEGER, allowNull: true },
    customerId: { type: DataTypes.INTEGER, allowNull: true },
    quantity: { type: DataTypes.INTEGER, allowNull: false },
    locationNote: { type: DataTypes.STRING(300), allowNull: true },
    contactName: { type: DataTypes.STRING(120), allowNull: true },
    contactPhone: { type: DataTypes.STRING(40), allowNull: true },
    contactEmail: { type: DataTypes.STRING(254), allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    readyOn: { type: DataTypes.DATEONLY, allowNull: true },
    plannedFor: { type: DataTypes.DATEONLY, allowNull: true },
    truckRunId: { type: DataTypes.INTEGER, allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    reportCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    lastReportedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    requestedBy: { type: DataTypes.INTEGER, allowNull: true },
    requesterIp: { type: DataTypes.STRING(64), allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'collection_requests', version: true },
);
