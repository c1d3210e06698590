/** Teams, memberships with a role, and invitations (only the token's SHA-256 is stored). */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };
const uuidPk = { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 };
const ROLES = ['owner', 'designer', 'reviewer', 'viewer'];

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('teams', {
    id: uuidPk,
    name: { type: DataTypes.STRING(80), allowNull: false },
    created_at: now,
    updated_at: now,
  });
  await qi.createTable('memberships', {
    id: uuidPk,
    team_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    user_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('memberships', ['team_id', 'user_id'], { unique: true, name: 'memberships_team_user_unique' });
  await qi.addIndex('memberships', ['user_id']);
  await qi.createTable('invitations', {
    id: uuidPk,
    team_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    invited_by_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_by_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('invitations', ['team_id']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('invitations');
  await qi.dropTable('memberships');
  await qi.dropTable('teams');
  await qi.sequelize.query('DROP TYPE IF EXISTS "enum_invitations_role"; DROP TYPE IF EXISTS "enum_memberships_role";');
}
