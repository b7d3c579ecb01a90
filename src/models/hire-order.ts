import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

export type HireOrderStatus = 'open' | 'loading' | 'dispatched' | 'closed' | 'cancelled';

/** A customer's order for a number of prepared bins at a site by a date, served from a depot. */
export class HireOrder extends Model<InferAttributes<HireOrder>, InferCreationAttributes<HireOrder>> {
  declare id: CreationOptional<number>;
  declare reference: string;
  declare customerId: number;
  declare deliverySiteId: number;
  declare depotSiteId: number;
  declare binTypeId: number;
  declare quantity: number;
  declare neededBy: string;
  declare status: CreationOptional<HireOrderStatus>;
  declare product: string | null;
  declare notes: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

HireOrder.init(
  {
    id: idColumn,
    reference: { type: DataTypes.STRING(32), allowNull: false, unique: true },
    customerId: { type: DataTypes.INTEGER, allowNull: false },
    deliverySiteId: { type: DataTypes.INTEGER, allowNull: false },
    depotSiteId: { type: DataTypes.INTEGER, allowNull: false },
    binTypeId: { type: DataTypes.INTEGER, allowNull: false },
    quantity: { type: DataTypes.INTEGER, allowNull: false },
    neededBy: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'open' },
    product: { type: DataTypes.STRING(120), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'hire_orders', version: true },
);
