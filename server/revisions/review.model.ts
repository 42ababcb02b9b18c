import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from '../users/user.model.ts';

export type Decision = 'approve' | 'return';

export class Review extends Model<InferAttributes<Review>, InferCreationAttributes<Review>> {
  declare id: CreationOptional<number>;
  declare revisionId: ForeignKey<number>;
  declare reviewerId: ForeignKey<number>;
  declare decision: Decision;
  declare comment: string | null;
  declare createdAt: Date;

  declare reviewer?: NonAttribute<User>;
}

export function initReview(sequelize: Sequelize) {
  Review.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      revisionId: { type: DataTypes.INTEGER, allowNull: false },
      reviewerId: { type: DataTypes.INTEGER, allowNull: false },
      decision: { type: DataTypes.STRING, allowNull: false },
      comment: { type: DataTypes.TEXT, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'reviews', underscored: true, timestamps: false },
  );
}
