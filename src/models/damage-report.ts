import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** A reported fault on a bin — from the public page, a customer or a yard. */
export class DamageReport extends Model<InferAttributes<DamageReport>, InferCreationAttributes<DamageReport>> {
  declare id: CreationOptional<number>;
  declare source: 'public' | 'portal' | 'yard';
  declare assetId: number | null;
  declare siteId: number | null;
  /** The customer whose hire the bin was on when reported (null when it was not on hire). */
  declare customerId: number | null;
  declare description: string;
  declare photoId: number | null;
  declare contactName: string | null;
  declare contactEmail: string | null;
  declare status: CreationOptional<'open' | 'triaged' | 'closed'>;
  declare reportedBy: number | null;
  declare requesterIp: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

DamageReport.init(
  {
    id: idColumn,
    source: { type: DataTypes.STRING(10), allowNull: false },
    assetId: { type: DataTypes.INTEGER, allowNull: true },
    siteId: { type: DataTypes.INTEGER, allowNull: true },
    customerId: { type: DataTypes.INTEGER, allowNull: true },
    description: { type: DataTypes.TEXT, allowNull: false },
    photoId: { type: DataTypes.INTEGER, allowNull: true },
    contactName: { type: DataTypes.STRING(120), allowNull: true },
    contactEmail: { type: DataTypes.STRING(254), allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'open' },
    reportedBy: { type: DataTypes.INTEGER, allowNull: true },
    requesterIp: { type: DataTypes.STRING(64), allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'damage_reports', version: true },
);
