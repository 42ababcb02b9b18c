import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Finding, SiteSummary } from '../../shared/index.ts';
import type { User } from '../users/user.model.ts';
import type { Review } from './review.model.ts';

export const REVISION_STATES = ['pending', 'approved', 'returned', 'superseded'] as const;
export type RevisionState = (typeof REVISION_STATES)[number];

export class Revision extends Model<InferAttributes<Revision>, InferCreationAttributes<Revision>> {
  declare id: CreationOptional<number>;
  declare siteId: ForeignKey<string>;
  /** 1, 2, … per site. */
  declare number: number;
  declare yaml: string;
  declare sha256: string;
  declare document: unknown;
  declare findings: Finding[];
  declare summary: SiteSummary | null;
  declare errorCount: number;
  declare warningCount: number;
  declare infoCount: number;
  declare authorId: ForeignKey<number>;
  declare message: string | null;
  /** The approved revision this one was based on (the site's approved one when it was pushed). */
  declare parentId: ForeignKey<number> | null;
  declare state: RevisionState;
  declare decidedAt: Date | null;
  declare decidedById: ForeignKey<number> | null;
  declare createdAt: Date;

  declare author?: NonAttribute<User>;
  declare reviews?: NonAttribute<Review[]>;
}

export function initRevision(sequelize: Sequelize) {
  Revision.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      siteId: { type: DataTypes.STRING, allowNull: false },
      number: { type: DataTypes.INTEGER, allowNull: false },
      yaml: { type: DataTypes.TEXT, allowNull: false },
      sha256: { type: DataTypes.STRING(64), allowNull: false },
      document: { type: DataTypes.JSON, allowNull: false },
      findings: { type: DataTypes.JSON, allowNull: false },
      summary: { type: DataTypes.JSON, allowNull: true },
      errorCount: { type: DataTypes.INTEGER, allowNull: false },
      warningCount: { type: DataTypes.INTEGER, allowNull: false },
      infoCount: { type: DataTypes.INTEGER, allowNull: false },
      authorId: { type: DataTypes.INTEGER, allowNull: false },
      message: { type: DataTypes.TEXT, allowNull: true },
      parentId: { type: DataTypes.INTEGER, allowNull: true },
      state: { type: DataTypes.STRING, allowNull: false },
      decidedAt: { type: DataTypes.DATE, allowNull: true },
      decidedById: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'revisions', underscored: true, timestamps: false },
  );
}
