import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** The operator itself and each customer, with the customer's hire terms. */
export class Organisation extends Model<InferAttributes<Organisation>, InferCreationAttributes<Organisation>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare kind: 'operator' | 'customer';
  declare contactEmail: string | null;
  declare freeDays: CreationOptional<number>;
  declare dailyRate: CreationOptional<string>;
  declare tripFee: CreationOptional<string>;
  declare lostBinFee: CreationOptional<string>;
  declare currency: CreationOptional<string>;
  /** ISO 3166 alpha-2; with the VAT number it decides reverse charge on statements. */
  declare country: CreationOptional<string | null>;
  declare vatId: CreationOptional<string | null>;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Organisation.init(
  {
    id: idColumn,
    name: { type: DataTypes.STRING(160), allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    contactEmail: { type: DataTypes.STRING(254), allowNull: true },
    freeDays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    dailyRate: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: '0' },
    tripFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: '0' },
    lostBinFee: { type: DataTypes.DECIMAL(10, 2), allowNull: false, defaultValue: '0' },
    country: { type: DataTypes.CHAR(2), allowNull: true },
    vatId: { type: DataTypes.STRING(20), allowNull: true },
    currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'EUR' },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'organisations', version: true },
);
