/**
 * Designs and their revisions. Revisions are append-only: a trigger refuses UPDATE on
 * design_revisions, and (design_id, number) is unique so two saves can never both write the
 * same revision number.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };
const uuidPk = { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('designs', {
    id: uuidPk,
    team_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    author_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    title: { type: DataTypes.STRING(120), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    visibility: { type: DataTypes.ENUM('private', 'team'), allowNull: false, defaultValue: 'team' },
    status: { type: DataTypes.ENUM('draft', 'in_review', 'approved', 'changes_requested'), allowNull: false, defaultValue: 'draft' },
    archived_at: { type: DataTypes.DATE, allowNull: true },
    forked_from_design_id: { type: DataTypes.UUID, allowNull: true, references: { model: 'designs', key: 'id' }, onDelete: 'SET NULL' },
    forked_from_revision: { type: DataTypes.INTEGER, allowNull: true },
    latest_revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    topology: { type: DataTypes.STRING(40), allowNull: true },
    stages: { type: DataTypes.INTEGER, allowNull: true },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('designs', ['team_id', 'updated_at']);
  await qi.addIndex('designs', ['forked_from_design_id']);
  await qi.sequelize.query('ALTER TABLE designs ADD CONSTRAINT designs_latest_revision_nonneg CHECK (latest_revision >= 0)');

  await qi.createTable('design_revisions', {
    id: uuidPk,
    design_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    number: { type: DataTypes.INTEGER, allowNull: false },
    document: { type: DataTypes.JSONB, allowNull: false },
    author_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    message: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
    created_at: now,
  });
  await qi.addIndex('design_revisions', ['design_id', 'number'], { unique: true, name: 'design_revisions_design_number_unique' });
  await qi.sequelize.query(`
    CREATE FUNCTION design_revisions_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN RAISE EXCEPTION 'design revisions are never updated in place'; END $$;
    CREATE TRIGGER design_revisions_no_update BEFORE UPDATE ON design_revisions
      FOR EACH ROW EXECUTE FUNCTION design_revisions_immutable();
  `);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('design_revisions');
  await qi.sequelize.query('DROP FUNCTION IF EXISTS design_revisions_immutable()');
  await qi.dropTable('designs');
  await qi.sequelize.query('DROP TYPE IF EXISTS "enum_designs_visibility"; DROP TYPE IF EXISTS "enum_designs_status";');
}
