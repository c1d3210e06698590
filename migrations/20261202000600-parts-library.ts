/**
 * The team parts library (issue 6): one row per part a team stocks — a capacitor, diode or
 * resistor with its kind-specific values in `specs` (SI units, see lib/parts/schema.ts), its
 * price, and an optional datasheet PDF whose bytes live in object storage under `datasheet_key`.
 * A part number is unique within its team, compared case-insensitively. The team's derating
 * policy (the share of a rating a part may be stressed to) is `teams.derating_fraction`.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW };

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('parts', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: DataTypes.UUIDV4 },
    team_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(16), allowNull: false },
    part_number: { type: DataTypes.STRING(64), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
    maker: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
    unit_cost: { type: DataTypes.DOUBLE, allowNull: true },
    currency: { type: DataTypes.STRING(3), allowNull: false, defaultValue: 'EUR' },
    specs: { type: DataTypes.JSONB, allowNull: false },
    datasheet_key: { type: DataTypes.STRING(300), allowNull: true },
    datasheet_name: { type: DataTypes.STRING(120), allowNull: true },
    datasheet_size: { type: DataTypes.INTEGER, allowNull: true },
    datasheet_uploaded_at: { type: DataTypes.DATE, allowNull: true },
    created_by: { type: DataTypes.UUID, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: now,
    updated_at: now,
  });
  await qi.sequelize.query('CREATE UNIQUE INDEX parts_team_part_number ON parts (team_id, lower(part_number))');
  await qi.addIndex('parts', ['team_id', 'kind']);
  await qi.sequelize.query(`ALTER TABLE parts ADD CONSTRAINT parts_kind CHECK (kind IN ('capacitor', 'diode', 'resistor'))`);
  await qi.sequelize.query('ALTER TABLE parts ADD CONSTRAINT parts_unit_cost CHECK (unit_cost IS NULL OR unit_cost >= 0)');
  await qi.sequelize.query(
    'ALTER TABLE parts ADD CONSTRAINT parts_datasheet CHECK ((datasheet_key IS NULL) = (datasheet_name IS NULL) AND (datasheet_key IS NULL) = (datasheet_size IS NULL) AND (datasheet_key IS NULL) = (datasheet_uploaded_at IS NULL))',
  );
  await qi.addColumn('teams', 'derating_fraction', { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0.8 });
  await qi.sequelize.query('ALTER TABLE teams ADD CONSTRAINT teams_derating_fraction CHECK (derating_fraction > 0 AND derating_fraction <= 1)');
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('ALTER TABLE teams DROP CONSTRAINT IF EXISTS teams_derating_fraction');
  await qi.removeColumn('teams', 'derating_fraction');
  await qi.dropTable('parts');
}
