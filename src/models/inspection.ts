import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '@/db/sequelize';
import { idColumn } from './columns';

export type InspectionKind = 'prep_check' | 'intermediate' | 'full' | 'after_repair';

/** A recorded check or periodic test of a bin and the due dates it sets. Evidence, not certification; never edited (a trigger refuses it). */
export class Inspection extends Model<InferAttributes<Inspection>, InferCreationAttributes<Inspection>> {
  declare id: CreationOptional<number>;
  declare assetId: number;
  declare kind: InspectionKind;
  declare performedOn: string;
  declare inspectorId: number | null;
  declare siteId: number | null;
  declare checklist: CreationOptional<Record<string, unknown>>;
  declare leakTestPressureKpa: string | null;
  declare leakTestMinutes: string | null;
  declare leakTestPassed: boolean | null;
  declare outcome: 'pass' | 'repair' | 'fail';
  declare nextIntermediateDue: string | null;
  declare nextFullDue: string | null;
  declare photoIds: CreationOptional<number[]>;
  declare notes: string | null;
  declare scanEventId: number | null;
  /** An outside inspection body named on the record, when no qualified user of the operator inspected. */
  declare inspectionBody: string | null;
  declare recordedBy: number | null;
  /** The mark to apply after a pass: month and year of the test and the inspector's mark. */
  declare testMark: string | null;
  /** A correction is a new record pointing at the one it corrects, with the reason. */
  declare amendsId: number | null;
  declare amendmentReason: string | null;
  declare createdAt: CreationOptional<Date>;
}

Inspection.init(
  {
    id: idColumn,
    assetId: { type: DataTypes.INTEGER, allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    performedOn: { type: DataTypes.DATEONLY, allowNull: false },
    inspectorId: { type: DataTypes.INTEGER, allowNull: true },
    siteId: { type: DataTypes.INTEGER, allowNull: true },
    checklist: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    leakTestPressureKpa: { type: DataTypes.DECIMAL(6, 1), allowNull: true },
    leakTestMinutes: { type: DataTypes.DECIMAL(6, 1), allowNull: true },
    leakTestPassed: { type: DataTypes.BOOLEAN, allowNull: true },
    outcome: { type: DataTypes.STRING(8), allowNull: false },
    nextIntermediateDue: { type: DataTypes.DATEONLY, allowNull: true },
    nextFullDue: { type: DataTypes.DATEONLY, allowNull: true },
    photoIds: { type: DataTypes.ARRAY(DataTypes.INTEGER), allowNull: false, defaultValue: [] },
    notes: { type: DataTypes.TEXT, allowNull: true },
    scanEventId: { type: DataTypes.BIGINT, allowNull: true },
    inspectionBody: { type: DataTypes.STRING(160), allowNull: true },
    recordedBy: { type: DataTypes.INTEGER, allowNull: true },
    testMark: { type: DataTypes.STRING(60), allowNull: true },
    amendsId: { type: DataTypes.INTEGER, allowNull: true },
    amendmentReason: { type: DataTypes.TEXT, allowNull: true },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: 'inspections', updatedAt: false },
);
