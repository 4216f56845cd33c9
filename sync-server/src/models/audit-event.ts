import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<string>;
  declare clinicId: string | null;
  declare userId: string | null;
  declare action: string;
  declare entity: CreationOptional<string | null>;
  declare entityId: CreationOptional<string | null>;
  declare occurredAt: CreationOptional<Date>;
  declare ip: CreationOptional<string | null>;
  declare details: CreationOptional<Record<string, unknown> | null>;
}

export function initAuditEvent(sequelize: Sequelize): void {
  AuditEvent.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      clinicId: DataTypes.UUID,
      userId: DataTypes.UUID,
      action: { type: DataTypes.TEXT, allowNull: false },
      entity: DataTypes.TEXT,
      entityId: DataTypes.TEXT,
      occurredAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      ip: DataTypes.TEXT,
      details: DataTypes.JSONB,
    },
    { sequelize, tableName: 'audit_events', underscored: true, timestamps: false },
  );
}
