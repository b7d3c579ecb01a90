import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { versionColumn } from './columns';

/** Operator-wide settings (one row): GS1 identity, time zone for all day counts, money, mail sender. */
export class Setting extends Model<InferAttributes<Setting>, InferCreationAttributes<Setting>> {
  declare id: CreationOptional<number>;
  declare operatorName: string;
  declare gs1CompanyPrefix: string;
  declare gs1PrefixLength: number;
  declare digitalLinkBase: string;
  declare timeZone: string;
  declare currency: string;
  declare taxRate: string;
  declare mailSender: string;
  declare returnInstructions: CreationOptional<string>;
  /** The operator's own return instructions per public-page language (`en`, `nl`, …); missing ones fall back. */
  declare returnInstructionsByLanguage: CreationOptional<Partial<Record<string, string>>>;
  /** How long the person who recorded a scan may undo it themselves, in seconds (0: no undo). */
  declare undoSeconds: CreationOptional<number>;
  /** Days over the free days before a bin is listed in the customer's overdue-return reminder. */
  declare reminderDaysOver: CreationOptional<number>;
  /** Days past an invoice's due date before the first payment reminder (then weekly). */
  declare paymentReminderDays: CreationOptional<number>;
  /** A repair that would cost more than this (operator currency) proposes the bin for retirement; null: never. */
  declare repairRetireThreshold: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare updatedAt: CreationOptional<Date>;
}

Setting.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, defaultValue: 1 },
    operatorName: { type: DataTypes.STRING(160), allowNull: false },
    gs1CompanyPrefix: { type: DataTypes.STRING(12), allowNull: false },
    gs1PrefixLength: { type: DataTypes.INTEGER, allowNull: false },
    digitalLinkBase: { type: DataTypes.STRING(200), allowNull: false },
    timeZone: { type: DataTypes.STRING(64), allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    taxRate: { type: DataTypes.DECIMAL(5, 4), allowNull: false },
    mailSender: { type: DataTypes.STRING(254), allowNull: false },
    returnInstructions: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    returnInstructionsByLanguage: { type: DataTypes.JSONB, allowNull: false, defaultValue: {}, field: 'return_instructions_by_language' },
    undoSeconds: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 30 },
    reminderDaysOver: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 3 },
    paymentReminderDays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 7 },
    repairRetireThreshold: { type: DataTypes.DECIMAL(12, 2), allowNull: true },
    version: versionColumn,
    updatedAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'settings', createdAt: false, version: true },
);
