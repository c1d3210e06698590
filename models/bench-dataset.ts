import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { BenchKind, BenchMapping } from '../lib/bench/mapping';
import type { User } from './user';

/** One stored point: x (A or s), y (V), the 1-based line of the file it came from. */
export type StoredPoint = [number, number, number];

/**
 * Measurements taken on a built supply (lib/bench): a load curve or a ripple capture read from an
 * uploaded CSV with `mapping`, the points in SI units, and the raw file's S3 key.
 */
export class BenchDataset extends Model<InferAttributes<BenchDataset>, InferCreationAttributes<BenchDataset>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  declare revision: number;
  declare kind: BenchKind;
  declare name: string;
  declare notes: string | null;
  declare mapping: BenchMapping;
  declare points: StoredPoint[];
  declare pointCount: number;
  declare fileKey: string;
  declare fileName: string;
  declare fileBytes: number;
  declare uploadedById: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare uploadedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize): typeof BenchDataset {
    BenchDataset.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(16), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: true },
        mapping: { type: DataTypes.JSONB, allowNull: false },
        points: { type: DataTypes.JSONB, allowNull: false },
        pointCount: { type: DataTypes.INTEGER, allowNull: false },
        fileKey: { type: DataTypes.STRING(300), allowNull: false },
        fileName: { type: DataTypes.STRING(120), allowNull: false },
        fileBytes: { type: DataTypes.INTEGER, allowNull: false },
        uploadedById: { type: DataTypes.UUID, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'benchDataset', tableName: 'bench_datasets' },
    );
    return BenchDataset;
  }
}
