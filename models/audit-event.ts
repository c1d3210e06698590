import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Kinds of thing an audit event is about. */
export type AuditTargetType = 'design' | 'revision' | 'review' | 'member' | 'invitation' | 'offer' | 'part';

/**
 * One entry of a team's audit log: who (actor) did what (action, e.g. `revision.saved`) to which
 * object (target type + id), with a small JSON summary that never holds secrets (no tokens,
 * hashes, passwords or documents). Rows are only ever inserted (a trigger refuses the rest).
 */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare actorId: string;
  declare action: string;
  declare targetType: AuditTargetType;
  declare targetId: string;
  declare summary: CreationOptional<Record<string, unknown>>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof AuditEvent {
    AuditEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        teamId: { type: DataTypes.UUID, allowNull: false },
        actorId: { type: DataTypes.UUID, allowNull: false },
        action: { type: DataTypes.STRING(48), allowNull: false },
        targetType: { type: DataTypes.STRING(24), allowNull: false },
        targetId: { type: DataTypes.UUID, allowNull: false },
        summary: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'auditEvent', tableName: 'audit_events', updatedAt: false },
    );
    return AuditEvent;
  }
}
