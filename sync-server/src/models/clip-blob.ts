import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export type ClipBlobState = 'receiving' | 'stored' | 'failed';

export class ClipBlob extends Model<InferAttributes<ClipBlob>, InferCreationAttributes<ClipBlob>> {
  /** sha256 (hex) of the bytes as stored: sealed clips are addressed by their sealed form. */
  declare sha256: string;
  declare clinicId: string;
  /** bigint column, so a string. */
  declare sizeBytes: string | number;
  declare contentType: string;
  /** null when the clip was refused: a refused clip keeps no bytes. */
  declare storageKey: string | null;
  declare state: CreationOptional<ClipBlobState>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initClipBlob(sequelize: Sequelize): void {
  ClipBlob.init(
    {
      sha256: { type: DataTypes.TEXT, primaryKey: true },
      clinicId: { type: DataTypes.UUID, allowNull: false },
      sizeBytes: { type: DataTypes.BIGINT, allowNull: false },
      contentType: { type: DataTypes.TEXT, allowNull: false },
      storageKey: { type: DataTypes.TEXT, allowNull: true },
      state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'receiving' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'clip_blobs', underscored: true },
  );
}
