/**
 * Bench data: measurements taken on a built supply (a load curve or a ripple capture), uploaded as
 * CSV, their column mapping and the points read from it (SI units), and the S3 key of the raw
 * file. `revision` is the design revision the dataset was first compared against.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('bench_datasets', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 },
    design_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'designs', key: 'id' }, onDelete: 'CASCADE' },
    revision: { type: DataTypes.INTEGER, allowNull: false },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: true },
    mapping: { type: DataTypes.JSONB, allowNull: false },
    /** [[x, y, line], …] in SI units (A or s, V) with the 1-based file line. */
    points: { type: DataTypes.JSONB, allowNull: false },
    point_count: { type: DataTypes.INTEGER, allowNull: false },
    file_key: { type: DataTypes.STRING(300), allowNull: false },
    file_name: { type: DataTypes.STRING(120), allowNull: false },
    file_bytes: { type: DataTypes.INTEGER, allowNull: false },
    uploaded_by_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('bench_datasets', ['design_id', 'created_at']);
  await qi.sequelize.query(`ALTER TABLE bench_datasets ADD CONSTRAINT bench_datasets_kind CHECK (kind IN ('loadCurve', 'ripple'))`);
  await qi.sequelize.query(`ALTER TABLE bench_datasets ADD CONSTRAINT bench_datasets_points CHECK (point_count BETWEEN 2 AND 20000 AND revision >= 1)`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('bench_datasets');
}
