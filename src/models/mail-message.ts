import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn } from './columns';

/** A message the app handed to its SMTP server, with the server's answer. */
export class MailMessage extends Model<InferAttributes<MailMessage>, InferCreationAttributes<MailMessage>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare kind: string;
  declare status: CreationOptional<'queued' | 'sent' | 'failed'>;
  declare messageId: string | null;
  declare error: string | null;
  declare createdAt: CreationOptional<Date>;
  declare sentAt: Date | null;
}

MailMessage.init(
  {
    id: idColumn,
    toAddress: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(300), allowNull: false },
    textBody: { type: DataTypes.TEXT, allowNull: false },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    messageId: { type: DataTypes.STRING(300), allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    createdAt: DataTypes.DATE,
    sentAt: { type: DataTypes.DATE, allowNull: true },
  },
  { sequelize, tableName: 'mail_outbox', updatedAt: false },
);
