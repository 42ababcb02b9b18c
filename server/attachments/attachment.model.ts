import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from '../users/user.model.ts';

export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  declare siteId: ForeignKey<string>;
  /** Content hash: also the key in the upload store. */
  declare sha256: string;
  declare size: number;
  /** The type found from the file's first bytes, never the one the client declared. */
  declare mediaType: string;
  declare filename: string;
  declare caption: string | null;
  declare uploadedById: ForeignKey<number>;
  declare createdAt: Date;

  declare uploadedBy?: NonAttribute<User>;
}

export function initAttachment(sequelize: Sequelize) {
  Attachment.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      siteId: { type: DataTypes.STRING, allowNull: false },
      sha256: { type: DataTypes.STRING(64), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      mediaType: { type: DataTypes.STRING, allowNull: false },
      filename: { type: DataTypes.STRING, allowNull: false },
      caption: { type: DataTypes.TEXT, allowNull: true },
      uploadedById: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'attachments', underscored: true, timestamps: false },
  );
}
