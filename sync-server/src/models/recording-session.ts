import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { SessionStatus } from '@/shared/protocol';
import type { Client } from './client';
import type { SiteRecording } from './site-recording';
import type { User } from './user';
import { syncableAttributes, syncableOptions, type SyncableColumns } from './syncable';

export class RecordingSession
  extends Model<InferAttributes<RecordingSession>, InferCreationAttributes<RecordingSession>>
  implements SyncableColumns
{
  declare id: string;
  declare clientId: string;
  declare operatorId: CreationOptional<string | null>;
  declare status: CreationOptional<SessionStatus>;
  declare startedAt: Date;
  declare finishedAt: CreationOptional<Date | null>;
  declare findings: CreationOptional<string | null>;
  declare plan: CreationOptional<string | null>;
  declare followUpDate: CreationOptional<string | null>;
  declare reviewedBy: CreationOptional<string | null>;
  declare reviewedAt: CreationOptional<Date | null>;
  declare clinicId: string;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare deletedAt: CreationOptional<Date | null>;
  declare changeSeq: CreationOptional<string>;

  declare client?: NonAttribute<Client>;
  declare operator?: NonAttribute<User | null>;
  declare siteRecordings?: NonAttribute<SiteRecording[]>;
}

export function initRecordingSession(sequelize: Sequelize): void {
  RecordingSession.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      clientId: { type: DataTypes.UUID, allowNull: false },
      operatorId: DataTypes.UUID,
      status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'in_progress' },
      startedAt: { type: DataTypes.DATE, allowNull: false },
      finishedAt: DataTypes.DATE,
      findings: DataTypes.TEXT,
      plan: DataTypes.TEXT,
      followUpDate: DataTypes.DATEONLY,
      reviewedBy: DataTypes.UUID,
      reviewedAt: DataTypes.DATE,
      ...syncableAttributes,
    },
    { sequelize, tableName: 'recording_sessions', ...syncableOptions },
  );
}
