import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  /** 1, 2, 3, … without gaps: a gap means a deleted event. */
  declare seq: number;
  /** ISO 8601 with milliseconds, stored as text so the hashed value is the stored value. */
  declare at: string;
  declare actorId: number | null;
  declare actorEmail: string | null;
  declare action: string;
  declare siteId: string | null;
  declare revisionId: number | null;
  /** JSON text, parsed by the service, so a row altered by hand can still be read and judged. */
  declare details: string;
  declare prevHash: string;
  declare hash: string;
}

export function initAuditEvent(sequelize: Sequelize) {
  AuditEvent.init(
    {
      seq: { type: DataTypes.INTEGER, primaryKey: true },
      at: { type: DataTypes.STRING, allowNull: false },
      actorId: { type: DataTypes.INTEGER, allowNull: true },
      actorEmail: { type: DataTypes.STRING, allowNull: true },
      action: { type: DataTypes.STRING, allowNull: false },
      siteId: { type: DataTypes.STRING, allowNull: true },
      revisionId: { type: DataTypes.INTEGER, allowNull: true },
      details: { type: DataTypes.TEXT, allowNull: false },
      prevHash: { type: DataTypes.STRING(64), allowNull: false },
      hash: { type: DataTypes.STRING(64), allowNull: false },
    },
    { sequelize, tableName: 'audit_events', underscored: true, timestamps: false },
  );
}
