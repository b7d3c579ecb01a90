import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';
import type { OrderStatus } from '../lib/planning/order-status';

/** The statuses and their rules live in `src/lib/planning/order-status.ts`. */
export type HireOrderStatus = OrderStatus;

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
  /** The liner grade the fill needs: food contact or not, and the highest filling temperature (°C). */
  declare linerFoodContact: CreationOptional<boolean>;
  declare linerMaxFillTempC: CreationOptional<number | null>;
  declare createdBy: CreationOptional<number | null>;
  declare confirmedAt: CreationOptional<Date | null>;
  /** When it was closed or cancelled. */
  declare finishedAt: CreationOptional<Date | null>;
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
    status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'draft' },
    product: { type: DataTypes.STRING(120), allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    linerFoodContact: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    linerMaxFillTempC: { type: DataTypes.SMALLINT, allowNull: true },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    confirmedAt: { type: DataTypes.DATE, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'hire_orders', version: true },
);
