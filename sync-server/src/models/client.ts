import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { syncableAttributes, syncableOptions, type SyncableColumns } from './syncable';

export class Client
  extends Model<InferAttributes<Client>, InferCreationAttributes<Client>>
  implements SyncableColumns
{
  declare id: string;
  declare firstName: string;
  declare lastName: string;
  declare dateOfBirth: CreationOptional<string | null>;
  declare email: CreationOptional<string | null>;
  declare phone: CreationOptional<string | null>;
  declare notes: CreationOptional<string | null>;
  declare clinicId: string;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare deletedAt: CreationOptional<Date | null>;
  declare changeSeq: CreationOptional<string>;
}

export function initClient(sequelize: Sequelize): void {
  Client.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      firstName: { type: DataTypes.TEXT, allowNull: false },
      lastName: { type: DataTypes.TEXT, allowNull: false },
      dateOfBirth: DataTypes.DATEONLY,
      email: DataTypes.TEXT,
      phone: DataTypes.TEXT,
      notes: DataTypes.TEXT,
      ...syncableAttributes,
    },
    { sequelize, tableName: 'clients', ...syncableOptions },
  );
}
