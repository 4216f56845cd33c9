import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class AppliedMutation extends Model<
  InferAttributes<AppliedMutation>,
  InferCreationAttributes<AppliedMutation>
> {
  declare mutationId: string;
  declare clinicId: string;
  declare userId: CreationOptional<string | null>;
  declare entity: string;
  declare rowId: string;
  declare result: object;
  declare appliedAt: CreationOptional<Date>;
}

export function initAppliedMutation(sequelize: Sequelize): void {
  AppliedMutation.init(
    {
      mutationId: { type: DataTypes.UUID, primaryKey: true },
      clinicId: { type: DataTypes.UUID, allowNull: false },
      userId: DataTypes.UUID,
      entity: { type: DataTypes.TEXT, allowNull: false },
      rowId: { type: DataTypes.UUID, allowNull: false },
      result: { type: DataTypes.JSONB, allowNull: false },
      appliedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    },
    { sequelize, tableName: 'applied_mutations', underscored: true, timestamps: false },
  );
}
