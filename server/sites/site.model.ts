import { DataTypes, Model, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Revision, RevisionState } from '../revisions/revision.model.ts';
import type { User } from '../users/user.model.ts';

export type SiteStatus = 'pending' | 'approved' | 'returned' | 'never-approved';

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  /** `site.id` of the file. */
  declare id: string;
  declare name: string;
  /** Derived from the latest revision and the approved one (deriveSiteStatus), kept for indexing. */
  declare status: SiteStatus;
  declare latestState: Exclude<RevisionState, 'superseded'>;
  declare approvedRevisionId: ForeignKey<number> | null;
  declare latestRevisionId: ForeignKey<number> | null;
  /** Counts of the latest revision, for sorting the list. */
  declare errorCount: number;
  declare warningCount: number;
  declare updatedById: ForeignKey<number> | null;
  declare createdAt: Date;
  declare updatedAt: Date;

  declare latestRevision?: NonAttribute<Revision | null>;
  declare approvedRevision?: NonAttribute<Revision | null>;
  declare updatedBy?: NonAttribute<User | null>;
}

export function initSite(sequelize: Sequelize) {
  Site.init(
    {
      id: { type: DataTypes.STRING, primaryKey: true },
      name: { type: DataTypes.STRING, allowNull: false },
      status: { type: DataTypes.STRING, allowNull: false },
      latestState: { type: DataTypes.STRING, allowNull: false },
      approvedRevisionId: { type: DataTypes.INTEGER, allowNull: true },
      latestRevisionId: { type: DataTypes.INTEGER, allowNull: true },
      errorCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      warningCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      updatedById: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
      updatedAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'sites', underscored: true, timestamps: false },
  );
}

/**
 * One status per site, for the list: the latest revision's review state says what the site needs
 * next (`pending` awaits a lead, `returned` awaits the installer); otherwise a site that was
 * never approved is `never-approved` (a state filter of the same name finds every site without
 * an approved revision, whatever its latest state).
 */
export function deriveSiteStatus(latestState: Site['latestState'], approvedRevisionId: number | null): SiteStatus {
  if (latestState === 'pending' || latestState === 'returned') return latestState;
  if (approvedRevisionId === null) return 'never-approved';
  return 'approved';
}
