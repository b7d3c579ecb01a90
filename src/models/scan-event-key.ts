import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';

/** The idempotency key of a client-generated scan, with the answer first given for it. */
export class ScanEventKey extends Model<InferAttributes<ScanEventKey>, InferCreationAttributes<ScanEventKey>> {
  declare clientEventId: string;
  declare userId: number | null;
  declare scanEventId: number | null;
  declare outcome: Record<string, unknown>;
  declare createdAt: CreationOptional<Date>;
}

ScanEventKey.init(
  {
    clientEventId: { type: DataTypes.UUID, primaryKey: true },
    userId: { type: DataTypes.INTEGER, allowNull: true },
    scanEventId: { type: DataTypes.BIGINT, allowNull: true },
    outcome: { type: DataTypes.JSONB, allowNull: false },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'scan_event_keys', updatedAt: false },
);
