/**
 * The audit log: one row per change that matters (who created, saved, shared, archived, forked,
 * approved or removed what), written in the same transaction as the change. Append-only: a
 * trigger refuses every UPDATE and DELETE (the log outlives the designs it names, so there is no
 * cascade from designs; target ids are plain values). Rows go with their team only when the team
 * itself is deleted.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('audit_events', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true, allowNull: false },
    team_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    actor_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    action: { type: DataTypes.STRING(48), allowNull: false },
    target_type: { type: DataTypes.STRING(24), allowNull: false },
    target_id: { type: DataTypes.UUID, allowNull: false },
    summary: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  });
  await qi.addIndex('audit_events', ['team_id', 'id']);
  await qi.sequelize.query(`
    ALTER TABLE audit_events ADD CONSTRAINT audit_events_action_shape CHECK (action ~ '^[a-z_]+\\.[a-z_]+$');
    CREATE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'DELETE' AND NOT EXISTS (SELECT 1 FROM teams WHERE id = OLD.team_id) THEN
        RETURN OLD;
      END IF;
      RAISE EXCEPTION 'audit events are never changed or removed';
    END $$;
    CREATE TRIGGER audit_events_no_change BEFORE UPDATE OR DELETE ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_append_only();
    CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
      FOR EACH STATEMENT EXECUTE FUNCTION audit_events_append_only();
  `);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('audit_events');
  await qi.sequelize.query('DROP FUNCTION IF EXISTS audit_events_append_only()');
}
