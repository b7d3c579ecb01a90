import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { Action, Status } from '@/lib/scans/lifecycle';

/** One entry of the append-only scan log. Never deleted: a wrong scan is voided with a reason. */
export class ScanEvent extends Model<InferAttributes<ScanEvent>, InferCreationAttributes<ScanEvent>> {
  declare id: CreationOptional<number>;
  declare assetId: number;
  declare action: Action;
  declare occurredAt: Date;
  declare recordedAt: CreationOptional<Date>;
  declare siteId: number | null;
  declare userId: number | null;
  declare clientEventId: string | null;
  declare statusFrom: Status | null;
  declare statusTo: Status;
  declare tripId: number | null;
  declare inferred: CreationOptional<boolean>;
  declare flagged: CreationOptional<boolean>;
  declare voidedAt: Date | null;
  declare voidedBy: number | null;
  declare voidReason: string | null;
  declare payload: CreationOptional<Record<string, unknown>>;
}

ScanEvent.init(
  {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    assetId: { type: DataTypes.INTEGER, allowNull: false },
    action: { type: DataTypes.STRING(24), allowNull: false },
    occurredAt: { type: DataTypes.DATE, allowNull: false },
    recordedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    siteId: { type: DataTypes.INTEGER, allowNull: true },
    userId: { type: DataTypes.INTEGER, allowNull: true },
    clientEventId: { type: DataTypes.UUID, allowNull: true },
    statusFrom: { type: DataTypes.STRING(24), allowNull: true },
    statusTo: { type: DataTypes.STRING(24), allowNull: false },
    tripId: { type: DataTypes.INTEGER, allowNull: true },
    inferred: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    flagged: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    voidedAt: { type: DataTypes.DATE, allowNull: true },
    voidedBy: { type: DataTypes.INTEGER, allowNull: true },
    voidReason: { type: DataTypes.TEXT, allowNull: true },
    payload: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
  },
  { sequelize, tableName: 'scan_events', timestamps: false },
);
