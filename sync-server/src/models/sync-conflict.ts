import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class SyncConflict extends Model<
  InferAttributes<SyncConflict>,
  InferCreationAttributes<SyncConflict>
> {
  declare id: string;
  declare clinicId: string;
  declare entity: string;
  declare rowId: string;
  declare mutationId: CreationOptional<string | null>;
  declare serverVersion: object;
  declare clientVersion: object;
  declare status: CreationOptional<'open' | 'resolved'>;
  declare resolution: CreationOptional<object | null>;
  declare resolvedBy: CreationOptional<string | null>;
  declare resolvedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initSyncConflict(sequelize: Sequelize): void {
  SyncConflict.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      clinicId: { type: DataTypes.UUID, allowNull: false },
      entity: { type: DataTypes.TEXT, allowNull: false },
      rowId: { type: DataTypes.UUID, allowNull: false },
      mutationId: DataTypes.UUID,
      serverVersion: { type: DataTypes.JSONB, allowNull: false },
      clientVersion: { type: DataTypes.JSONB, allowNull: false },
      status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'open' },
      resolution: DataTypes.JSONB,
      resolvedBy: DataTypes.UUID,
      resolvedAt: DataTypes.DATE,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'sync_conflicts', underscored: true },
  );
}
