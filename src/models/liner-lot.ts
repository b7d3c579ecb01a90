import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** A supplier's lot of single-use liners received at a depot. Stock on hand is derived, never stored. */
export class LinerLot extends Model<InferAttributes<LinerLot>, InferCreationAttributes<LinerLot>> {
  declare id: CreationOptional<number>;
  declare supplier: string;
  declare lotNumber: string;
  declare spec: string;
  declare quantityReceived: number;
  declare receivedOn: string;
  declare expiryDate: string;
  declare status: CreationOptional<'released' | 'on_hold' | 'recalled'>;
  declare siteId: number;
  declare certificateId: number | null;
  declare linerSpecId: CreationOptional<number | null>;
  declare supplierId: CreationOptional<number | null>;
  declare statusReason: string | null;
  /** When the lot was last put on hold, recalled or released (null: never since it arrived). */
  declare statusChangedAt: CreationOptional<Date | null>;
  declare statusChangedBy: CreationOptional<number | null>;
  declare purchaseOrderId: CreationOptional<number | null>;
  declare manufacturedOn: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

LinerLot.init(
  {
    id: idColumn,
    supplier: { type: DataTypes.STRING(120), allowNull: false },
    lotNumber: { type: DataTypes.STRING(40), allowNull: false },
    spec: { type: DataTypes.STRING(160), allowNull: false },
    quantityReceived: { type: DataTypes.INTEGER, allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    expiryDate: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'released' },
    siteId: { type: DataTypes.INTEGER, allowNull: false },
    certificateId: { type: DataTypes.INTEGER, allowNull: true },
    linerSpecId: { type: DataTypes.INTEGER, allowNull: true },
    supplierId: { type: DataTypes.INTEGER, allowNull: true },
    statusReason: { type: DataTypes.TEXT, allowNull: true },
    statusChangedAt: { type: DataTypes.DATE, allowNull: true },
    statusChangedBy: { type: DataTypes.INTEGER, allowNull: true },
    purchaseOrderId: { type: DataTypes.INTEGER, allowNull: true },
    manufacturedOn: { type: DataTypes.DATEONLY, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'liner_lots', version: true },
);
