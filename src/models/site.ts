import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

export type SiteKind = 'depot' | 'customer' | 'repair' | 'recycling';

/** A place bins stand: the operator's depots, customers' filling and receiving sites, repair and recycling points. */
export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare code: string;
  declare name: string;
  declare kind: SiteKind;
  declare address: string | null;
  declare latitude: string | null;
  declare longitude: string | null;
  /** Bins a collection must have before a truck goes (truck runs; 1 = any). */
  declare minCollectionQty: CreationOptional<number>;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Site.init(
  {
    id: idColumn,
    organisationId: { type: DataTypes.INTEGER, allowNull: false },
    code: { type: DataTypes.STRING(24), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    address: { type: DataTypes.TEXT, allowNull: true },
    latitude: { type: DataTypes.DECIMAL(9, 6), allowNull: true },
    longitude: { type: DataTypes.DECIMAL(9, 6), allowNull: true },
    minCollectionQty: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'sites', version: true },
);
