import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import type { ViewState } from '@/lib/fleet/grid-views';

/** A planner's saved grid view (filter, sort, columns), private or shared with all planners and admins. */
export class GridView extends Model<InferAttributes<GridView>, InferCreationAttributes<GridView>> {
  declare id: CreationOptional<number>;
  declare ownerId: number;
  declare grid: string;
  declare name: string;
  declare shared: CreationOptional<boolean>;
  declare state: ViewState;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

GridView.init(
  {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    ownerId: { type: DataTypes.INTEGER, allowNull: false },
    grid: { type: DataTypes.STRING(32), allowNull: false },
    name: { type: DataTypes.STRING(80), allowNull: false },
    shared: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    state: { type: DataTypes.JSONB, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'grid_views', version: true },
);
