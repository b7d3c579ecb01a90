import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn } from './columns';

/** An uploaded file stored in PostgreSQL; served only through an authorised endpoint. */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  declare content: Buffer;
  declare contentType: string;
  declare byteSize: number;
  declare sha256: string;
  declare filename: string | null;
  declare purpose: 'photo' | 'certificate' | 'import' | 'document';
  declare organisationId: number | null;
  declare uploadedBy: number | null;
  /** The bin a scan's photo belongs to, set by the first scan that names it. */
  declare assetId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
}

Attachment.init(
  {
    id: idColumn,
    content: { type: DataTypes.BLOB, allowNull: false },
    contentType: { type: DataTypes.STRING(100), allowNull: false },
    byteSize: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    filename: { type: DataTypes.STRING(200), allowNull: true },
    purpose: { type: DataTypes.STRING(32), allowNull: false },
    organisationId: { type: DataTypes.INTEGER, allowNull: true },
    uploadedBy: { type: DataTypes.INTEGER, allowNull: true },
    assetId: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE,
  },
  // Never load the bytes unless asked: lists of attachments stay light.
  { sequelize, tableName: 'attachments', updatedAt: false, defaultScope: { attributes: { exclude: ['content'] } }, scopes: { withContent: {} } },
);
