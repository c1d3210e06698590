import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { AnalysisSpec, PointResult, AnalysisResult } from '../lib/analyses';

export type AnalysisStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

/**
 * One sweep or tolerance spread of one design revision, worked by the background worker
 * (scripts/worker.ts). The pg-boss job has the same id. Progress and points are written by the
 * worker in its own short transactions; the result once, with status 'done'.
 */
export class Analysis extends Model<InferAttributes<Analysis>, InferCreationAttributes<Analysis>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  declare revision: number;
  declare kind: 'sweep' | 'spread';
  declare spec: AnalysisSpec;
  declare status: CreationOptional<AnalysisStatus>;
  declare progress: CreationOptional<number>;
  declare donePoints: CreationOptional<number>;
  declare totalPoints: number;
  declare points: CreationOptional<PointResult[]>;
  declare result: CreationOptional<AnalysisResult | null>;
  declare error: CreationOptional<string | null>;
  declare createdBy: string;
  declare attempts: CreationOptional<number>;
  declare heartbeatAt: CreationOptional<Date | null>;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Analysis {
    Analysis.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(16), allowNull: false },
        spec: { type: DataTypes.JSONB, allowNull: false },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
        progress: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        donePoints: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        totalPoints: { type: DataTypes.INTEGER, allowNull: false },
        points: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        result: { type: DataTypes.JSONB, allowNull: true },
        error: { type: DataTypes.TEXT, allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: false },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        heartbeatAt: { type: DataTypes.DATE, allowNull: true },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'analysis', tableName: 'analyses' },
    );
    return Analysis;
  }
}
