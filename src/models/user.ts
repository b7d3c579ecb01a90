import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn, versionColumn, timestampColumns } from './columns';
import type { Role } from '@/lib/permissions';

/** Someone who signs in. Invited users have no password until they follow their link. */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare passwordHash: string | null;
  declare role: Role;
  declare organisationId: number;
  declare homeSiteId: number | null;
  declare qualifiedInspector: CreationOptional<boolean>;
  /** A customer user who may invite colleagues and limit them to sites (customers only). */
  declare portalAdmin: CreationOptional<boolean>;
  declare active: CreationOptional<boolean>;
  declare lastSignInAt: Date | null;
  /** Counted up to end all of this person's sessions at once (src/lib/session/). */
  declare sessionEpoch: CreationOptional<number>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

User.init(
  {
    id: idColumn,
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(160), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: true },
    role: { type: DataTypes.STRING(16), allowNull: false },
    organisationId: { type: DataTypes.INTEGER, allowNull: false },
    homeSiteId: { type: DataTypes.INTEGER, allowNull: true },
    qualifiedInspector: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    portalAdmin: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    lastSignInAt: { type: DataTypes.DATE, allowNull: true },
    sessionEpoch: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    version: versionColumn,
    ...timestampColumns,
  },
  { sequelize, tableName: 'users', version: true },
);
