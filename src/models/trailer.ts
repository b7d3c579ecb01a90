import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';

/** A trailer the operator plans loads and runs with: inside size and payload (admin data). */
export class Trailer extends Model<InferAttributes<Trailer>, InferCreationAttributes<Trailer>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare insideLengthMm: number;
  declare insideWidthMm: number;
  declare insideHeightMm: number;
  declare payloadKg: number;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Trailer.init(
  {
    id: idColumn,
    name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
    insideLengthMm: { type: DataTypes.INTEGER, allowNull: false },
    insideWidthMm: { type: DataTypes.INTEGER, allowNull: false },
    insideHeightMm: { type: DataTypes.INTEGER, allowNull: false },
    payloadKg: { type: DataTypes.INTEGER, allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'trailers', version: true },
);
