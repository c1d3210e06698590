/**
 * Comments pinned to a design, a node or a part of one revision (with replies, resolve/reopen
 * and mentions), the activity feed (one event, many recipients) and per-user switches for the
 * e-mail kinds.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };
const uuidPk = { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 };
const ref = (model: string, allowNull: boolean, onDelete: 'RESTRICT' | 'SET NULL' | 'CASCADE') => ({
  type: DataTypes.UUID,
  allowNull,
  references: { model, key: 'id' },
  onDelete,
});

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('comments', {
    id: uuidPk,
    design_id: ref('designs', false, 'CASCADE'),
    revision: { type: DataTypes.INTEGER, allowNull: false },
    parent_id: ref('comments', true, 'CASCADE'),
    author_id: ref('users', false, 'RESTRICT'),
    body: { type: DataTypes.TEXT, allowNull: false },
    anchor: { type: DataTypes.JSONB, allowNull: false },
    mention_ids: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
    resolved_at: { type: DataTypes.DATE, allowNull: true },
    resolved_by_id: ref('users', true, 'SET NULL'),
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('comments', ['design_id', 'revision', 'created_at']);
  await qi.addIndex('comments', ['parent_id']);
  await qi.sequelize.query(`ALTER TABLE comments ADD CONSTRAINT comments_body_length CHECK (char_length(body) BETWEEN 1 AND 4000)`);

  await qi.createTable('activity_events', {
    id: uuidPk,
    kind: { type: DataTypes.STRING(32), allowNull: false },
    team_id: ref('teams', false, 'CASCADE'),
    design_id: ref('designs', true, 'CASCADE'),
    actor_id: ref('users', false, 'CASCADE'),
    summary: { type: DataTypes.STRING(500), allowNull: false },
    path: { type: DataTypes.STRING(500), allowNull: false },
    created_at: now,
  });
  await qi.addIndex('activity_events', ['team_id', 'created_at']);

  await qi.createTable('activity_recipients', {
    event_id: { ...ref('activity_events', false, 'CASCADE'), primaryKey: true },
    user_id: { ...ref('users', false, 'CASCADE'), primaryKey: true },
  });
  await qi.addIndex('activity_recipients', ['user_id']);

  await qi.createTable('notification_settings', {
    user_id: { ...ref('users', false, 'CASCADE'), primaryKey: true },
    /** Mail kinds this user turned off; every other kind is on. */
    muted: { type: DataTypes.ARRAY(DataTypes.STRING(32)), allowNull: false, defaultValue: [] },
    updated_at: now,
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('notification_settings');
  await qi.dropTable('activity_recipients');
  await qi.dropTable('activity_events');
  await qi.dropTable('comments');
}
