import { DataTypes, type CreationOptional } from 'sequelize';

/** Columns shared by every row a device can create. */
export interface SyncableColumns {
  clinicId: string;
  version: CreationOptional<number>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
  deletedAt: CreationOptional<Date | null>;
  /** Filled by the database from one sequence on every insert and update; bigint, so a string. */
  changeSeq: CreationOptional<string>;
}

export const syncableAttributes = {
  clinicId: { type: DataTypes.UUID, allowNull: false },
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
  createdAt: DataTypes.DATE,
  updatedAt: DataTypes.DATE,
  deletedAt: DataTypes.DATE,
  // The database default and trigger own this column; Sequelize never writes it.
  changeSeq: { type: DataTypes.BIGINT },
} as const;

export const syncableOptions = { underscored: true, paranoid: true } as const;
