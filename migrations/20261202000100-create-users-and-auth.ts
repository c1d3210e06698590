/** Users with password hashes, next-auth's adapter tables (G7) and the failed sign-in counter. */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };
const uuidPk = { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('users', {
    id: uuidPk,
    name: { type: DataTypes.STRING(80), allowNull: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    email_verified: { type: DataTypes.DATE, allowNull: true },
    image: { type: DataTypes.STRING(500), allowNull: true },
    password_hash: { type: DataTypes.STRING(100), allowNull: true },
    created_at: now,
    updated_at: now,
  });
  await qi.createTable('accounts', {
    id: uuidPk,
    user_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    type: { type: DataTypes.STRING, allowNull: false },
    provider: { type: DataTypes.STRING, allowNull: false },
    provider_account_id: { type: DataTypes.STRING, allowNull: false },
    refresh_token: { type: DataTypes.TEXT },
    access_token: { type: DataTypes.TEXT },
    expires_at: { type: DataTypes.INTEGER },
    token_type: { type: DataTypes.STRING },
    scope: { type: DataTypes.STRING },
    id_token: { type: DataTypes.TEXT },
    session_state: { type: DataTypes.STRING },
  });
  await qi.addIndex('accounts', ['provider', 'provider_account_id'], { unique: true });
  await qi.createTable('sessions', {
    id: uuidPk,
    user_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    expires: { type: DataTypes.DATE, allowNull: false },
    session_token: { type: DataTypes.STRING, allowNull: false, unique: true },
  });
  await qi.createTable('verification_tokens', {
    token: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
    identifier: { type: DataTypes.STRING, allowNull: false },
    expires: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.createTable('sign_in_throttles', {
    email: { type: DataTypes.STRING(254), primaryKey: true, allowNull: false },
    failures: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    window_started_at: now,
    locked_until: { type: DataTypes.DATE, allowNull: true },
  });
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('sign_in_throttles');
  await qi.dropTable('verification_tokens');
  await qi.dropTable('sessions');
  await qi.dropTable('accounts');
  await qi.dropTable('users');
}
