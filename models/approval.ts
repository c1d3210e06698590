import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { User } from './user';

/**
 * The record that a colleague approved one revision of a design: who, when, which revision.
 * Rows are only ever inserted (a trigger refuses UPDATE, and DELETE except when the design
 * itself goes); a later approval supersedes an earlier one. It records a review, never that the
 * design is safe.
 */
export class Approval extends Model<InferAttributes<Approval>, InferCreationAttributes<Approval>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  declare reviewRequestId: string;
  declare revision: number;
  declare approvedById: string;
  declare note: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare approvedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize): typeof Approval {
    Approval.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        reviewRequestId: { type: DataTypes.UUID, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        approvedById: { type: DataTypes.UUID, allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'approval', tableName: 'approvals', updatedAt: false },
    );
    return Approval;
  }
}
