/**
 * Analysis runs (sweeps and tolerance spreads) worked in the background. One row per run: the
 * pg-boss job that carries it has the same id and holds nothing else. `points` collects the
 * computed points in index order (`done_points` of them); `result` is written once, with
 * status 'done', by an UPDATE guarded by `status <> 'done'`. `attempts` counts the workers
 * that claimed the run; `heartbeat_at` is when the claiming worker last wrote.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('analyses', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 },
    design_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    spec: { type: DataTypes.JSONB, allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    progress: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    done_points: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    total_points: { type: DataTypes.INTEGER, allowNull: false },
    points: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    result: { type: DataTypes.JSONB, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    created_by: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    started_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('analyses', ['design_id', 'created_at']);
  await qi.addIndex('analyses', ['status']);
  await qi.sequelize.query(`ALTER TABLE analyses ADD CONSTRAINT analyses_kind CHECK (kind IN ('sweep', 'spread'))`);
  await qi.sequelize.query(`ALTER TABLE analyses ADD CONSTRAINT analyses_status CHECK (status IN ('queued', 'running', 'done', 'failed', 'cancelled'))`);
  await qi.sequelize.query(`ALTER TABLE analyses ADD CONSTRAINT analyses_progress CHECK (progress >= 0 AND progress <= 1 AND done_points >= 0 AND done_points <= total_points)`);
  await qi.sequelize.query(`ALTER TABLE analyses ADD CONSTRAINT analyses_points_count CHECK (jsonb_array_length(points) = done_points)`);
  await qi.sequelize.query(`ALTER TABLE analyses ADD CONSTRAINT analyses_done_has_result CHECK ((status = 'done') = (result IS NOT NULL))`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('analyses');
}
