import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { ClipState, QualityVerdict, Site } from '@/shared/protocol';
import { syncableAttributes, syncableOptions, type SyncableColumns } from './syncable';

export class SiteRecording
  extends Model<InferAttributes<SiteRecording>, InferCreationAttributes<SiteRecording>>
  implements SyncableColumns
{
  declare id: string;
  declare sessionId: string;
  declare site: Site;
  declare qualityVerdict: CreationOptional<QualityVerdict | null>;
  declare clipSha256: CreationOptional<string | null>;
  declare clipState: CreationOptional<ClipState>;
  declare durationS: CreationOptional<number | null>;
  declare recordedAt: CreationOptional<Date | null>;
  /** The server's analysis of record (shared/analysis AnalysisResult), not the device's. */
  declare analysis: CreationOptional<object | null>;
  declare skippedReason: CreationOptional<string | null>;
  declare keepAnywayNote: CreationOptional<string | null>;
  declare clinicId: string;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare deletedAt: CreationOptional<Date | null>;
  declare changeSeq: CreationOptional<string>;
}

export function initSiteRecording(sequelize: Sequelize): void {
  SiteRecording.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      sessionId: { type: DataTypes.UUID, allowNull: false },
      site: { type: DataTypes.TEXT, allowNull: false },
      qualityVerdict: DataTypes.TEXT,
      clipSha256: DataTypes.TEXT,
      clipState: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'none' },
      durationS: DataTypes.REAL,
      recordedAt: DataTypes.DATE,
      analysis: DataTypes.JSONB,
      skippedReason: DataTypes.TEXT,
      keepAnywayNote: DataTypes.TEXT,
      ...syncableAttributes,
    },
    { sequelize, tableName: 'site_recordings', ...syncableOptions },
  );
}
