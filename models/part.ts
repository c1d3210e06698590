import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { PartKind } from '../lib/parts/schema';

/**
 * One part of a team's library (lib/data/parts.ts): kind, the team's part number (unique per
 * team, case-insensitively), maker, price, the kind's values in `specs` (SI units, checked by
 * lib/parts/schema.ts before every write) and an optional datasheet PDF kept in object storage.
 */
export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare kind: PartKind;
  declare partNumber: string;
  declare description: string;
  declare maker: string;
  declare unitCost: number | null;
  declare currency: string;
  declare specs: Record<string, unknown>;
  declare datasheetKey: CreationOptional<string | null>;
  declare datasheetName: CreationOptional<string | null>;
  declare datasheetSize: CreationOptional<number | null>;
  declare datasheetUploadedAt: CreationOptional<Date | null>;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Part {
    Part.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        teamId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.STRING(16), allowNull: false },
        partNumber: { type: DataTypes.STRING(64), allowNull: false },
        description: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
        maker: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
        unitCost: { type: DataTypes.DOUBLE, allowNull: true },
        currency: { type: DataTypes.STRING(3), allowNull: false, defaultValue: 'EUR' },
        specs: { type: DataTypes.JSONB, allowNull: false },
        datasheetKey: { type: DataTypes.STRING(300), allowNull: true },
        datasheetName: { type: DataTypes.STRING(120), allowNull: true },
        datasheetSize: { type: DataTypes.INTEGER, allowNull: true },
        datasheetUploadedAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'part', tableName: 'parts' },
    );
    return Part;
  }
}
