import { DataTypes } from 'sequelize';

// Column definitions every model repeats, written once.
export const idColumn = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true } as const;
/** Optimistic locking: the migration creates `version INTEGER NOT NULL DEFAULT 0`; models set `version: true`. */
export const versionColumn = { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 } as const;
export const timestampColumns = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE } as const;
