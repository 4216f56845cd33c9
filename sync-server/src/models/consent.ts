import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { syncableAttributes, syncableOptions, type SyncableColumns } from './syncable';

export class Consent
  extends Model<InferAttributes<Consent>, InferCreationAttributes<Consent>>
  implements SyncableColumns
{
  declare id: string;
  declare clientId: string;
  declare consentTextId: string;
  declare consentTextVersion: number;
  declare typedName: string;
  declare consentDate: string;
  declare recordedBy: CreationOptional<string | null>;
  declare clinicId: string;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare deletedAt: CreationOptional<Date | null>;
  declare changeSeq: CreationOptional<string>;
}

export function initConsent(sequelize: Sequelize): void {
  Consent.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      clientId: { type: DataTypes.UUID, allowNull: false },
      consentTextId: { type: DataTypes.UUID, allowNull: false },
      consentTextVersion: { type: DataTypes.INTEGER, allowNull: false },
      typedName: { type: DataTypes.TEXT, allowNull: false },
      consentDate: { type: DataTypes.DATEONLY, allowNull: false },
      recordedBy: DataTypes.UUID,
      ...syncableAttributes,
    },
    { sequelize, tableName: 'consents', ...syncableOptions },
  );
}
