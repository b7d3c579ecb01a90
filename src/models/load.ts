import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** Many bins going out on one truck against one hire order (or a transfer of empties). */
export class Load extends Model<InferAttributes<Load>, InferCreationAttributes<Load>> {
  declare id: CreationOptional<number>;
  declare reference: string;
  declare hireOrderId: number | null;
  declare depotSiteId: number;
  declare destinationSiteId: number | null;
  declare purpose: CreationOptional<'hire' | 'transfer'>;
  declare targetCount: number;
  declare status: CreationOptional<'loading' | 'dispatched' | 'delivered' | 'cancelled'>;
  declare carrier: string | null;
  declare vehicleRegistration: string | null;
  declare driverName: string | null;
  declare trailerSeals: CreationOptional<string[]>;
  declare trailerId: CreationOptional<number | null>;
  declare dispatchedAt: Date | null;
  declare deliveredAt: Date | null;
  declare receivedByName: string | null;
  declare deliveryPhotoId: number | null;
  declare createdBy: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Load.init(
  {
    id: idColumn,
    reference: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    hireOrderId: { type: DataTypes.INTEGER, allowNull: true },
    depotSiteId: { type: DataTypes.INTEGER, allowNull: false },
    destinationSiteId: { type: DataTypes.INTEGER, allowNull: true },
    purpose: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'hire' },
    targetCount: { type: DataTypes.INTEGER, allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'loading' },
    carrier: { type: DataTypes.STRING(120), allowNull: true },
    vehicleRegistration: { type: DataTypes.STRING(20), allowNull: true },
    driverName: { type: DataTypes.STRING(120), allowNull: true },
    trailerSeals: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
    trailerId: { type: DataTypes.INTEGER, allowNull: true },
    dispatchedAt: { type: DataTypes.DATE, allowNull: true },
    deliveredAt: { type: DataTypes.DATE, allowNull: true },
    receivedByName: { type: DataTypes.STRING(120), allowNull: true },
    deliveryPhotoId: { type: DataTypes.INTEGER, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'loads', version: true },
);
