/**
 * Review requests (with their named reviewers), approvals and offers back from forks, and the
 * design status 'changed_since_approval'. Approvals are immutable: a trigger refuses UPDATE, and
 * DELETE unless the design itself is being deleted (the cascade). One open review request per
 * design and one open offer per fork (partial unique indexes).
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };
const uuidPk = { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 };
const design = (onDelete: 'CASCADE') => ({ type: DataTypes.UUID, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete });
const user = (allowNull: boolean, onDelete: 'RESTRICT' | 'SET NULL' | 'CASCADE') => ({
  type: DataTypes.UUID,
  allowNull,
  references: { model: 'users', key: 'id' },
  onDelete,
});

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(`ALTER TYPE "enum_designs_status" ADD VALUE IF NOT EXISTS 'changed_since_approval'`);

  await qi.createTable('review_requests', {
    id: uuidPk,
    design_id: design('CASCADE'),
    revision: { type: DataTypes.INTEGER, allowNull: false },
    requested_by_id: user(false, 'RESTRICT'),
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    state: { type: DataTypes.ENUM('open', 'approved', 'changes_requested', 'withdrawn', 'superseded'), allowNull: false, defaultValue: 'open' },
    decided_by_id: user(true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    decision_note: { type: DataTypes.TEXT, allowNull: true },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('review_requests', ['design_id', 'created_at']);
  await qi.sequelize.query(`CREATE UNIQUE INDEX review_requests_one_open ON review_requests (design_id) WHERE state = 'open'`);
  await qi.sequelize.query('ALTER TABLE review_requests ADD CONSTRAINT review_requests_revision_positive CHECK (revision >= 1)');

  await qi.createTable('review_request_reviewers', {
    review_request_id: { type: DataTypes.UUID, allowNull: false, primaryKey: true, references: { model: 'review_requests', key: 'id' }, onDelete: 'CASCADE' },
    user_id: { ...user(false, 'CASCADE'), primaryKey: true },
  });
  await qi.addIndex('review_request_reviewers', ['user_id']);

  await qi.createTable('approvals', {
    id: uuidPk,
    design_id: design('CASCADE'),
    review_request_id: { type: DataTypes.UUID, allowNull: false, unique: true, references: { model: 'review_requests', key: 'id' }, onDelete: 'CASCADE' },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    approved_by_id: user(false, 'RESTRICT'),
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    created_at: now,
  });
  await qi.addIndex('approvals', ['design_id', 'created_at']);
  await qi.sequelize.query(`
    CREATE FUNCTION approvals_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'DELETE' AND NOT EXISTS (SELECT 1 FROM designs WHERE id = OLD.design_id) THEN
        RETURN OLD;
      END IF;
      RAISE EXCEPTION 'approvals are never changed or removed';
    END $$;
    CREATE TRIGGER approvals_no_change BEFORE UPDATE OR DELETE ON approvals
      FOR EACH ROW EXECUTE FUNCTION approvals_immutable();
  `);

  await qi.createTable('fork_offers', {
    id: uuidPk,
    fork_design_id: design('CASCADE'),
    fork_revision: { type: DataTypes.INTEGER, allowNull: false },
    parent_design_id: design('CASCADE'),
    parent_base_revision: { type: DataTypes.INTEGER, allowNull: false },
    offered_by_id: user(false, 'RESTRICT'),
    message: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
    state: { type: DataTypes.ENUM('open', 'accepted', 'declined', 'withdrawn'), allowNull: false, defaultValue: 'open' },
    decided_by_id: user(true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    decision_note: { type: DataTypes.TEXT, allowNull: true },
    resulting_revision: { type: DataTypes.INTEGER, allowNull: true },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('fork_offers', ['parent_design_id', 'created_at']);
  await qi.addIndex('fork_offers', ['fork_design_id', 'created_at']);
  await qi.sequelize.query(`CREATE UNIQUE INDEX fork_offers_one_open ON fork_offers (fork_design_id) WHERE state = 'open'`);
}

/**
 * Drops the tables. PostgreSQL cannot remove an enum value, so designs marked
 * 'changed_since_approval' are set back to 'approved' and the value stays in the type.
 */
export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('fork_offers');
  await qi.dropTable('approvals');
  await qi.sequelize.query('DROP FUNCTION IF EXISTS approvals_immutable()');
  await qi.dropTable('review_request_reviewers');
  await qi.dropTable('review_requests');
  await qi.sequelize.query(`DROP TYPE IF EXISTS "enum_fork_offers_state"; DROP TYPE IF EXISTS "enum_review_requests_state";`);
  await qi.sequelize.query(`UPDATE designs SET status = 'approved' WHERE status = 'changed_since_approval'`);
}
