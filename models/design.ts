import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { DESIGN_STATUSES, type DesignStatus, type Visibility } from '../lib/api/contract';
import type { User } from './user';

/**
 * A design: the head of a chain of immutable revisions. `latestRevision` is the optimistic
 * concurrency counter (see lib/data/designs.ts); `topology` and `stages` are copied from the
 * latest revision at each save so the list needs no JSONB work.
 */
export class Design extends Model<InferAttributes<Design>, InferCreationAttributes<Design>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare authorId: string;
  declare title: string;
  declare description: CreationOptional<string>;
  declare visibility: CreationOptional<Visibility>;
  declare status: CreationOptional<DesignStatus>;
  declare archivedAt: Date | null;
  declare forkedFromDesignId: string | null;
  declare forkedFromRevision: number | null;
  declare latestRevision: CreationOptional<number>;
  declare topology: string | null;
  declare stages: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare author?: NonAttribute<User>;
  declare forkedFrom?: NonAttribute<Design | null>;

  static initModel(sequelize: Sequelize): typeof Design {
    Design.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        teamId: { type: DataTypes.UUID, allowNull: false },
        authorId: { type: DataTypes.UUID, allowNull: false },
        title: { type: DataTypes.STRING(120), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        visibility: { type: DataTypes.ENUM('private', 'team'), allowNull: false, defaultValue: 'team' },
        status: { type: DataTypes.ENUM(...DESIGN_STATUSES), allowNull: false, defaultValue: 'draft' },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        forkedFromDesignId: { type: DataTypes.UUID, allowNull: true },
        forkedFromRevision: { type: DataTypes.INTEGER, allowNull: true },
        latestRevision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        topology: { type: DataTypes.STRING(40), allowNull: true },
        stages: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'design', tableName: 'designs' },
    );
    return Design;
  }
}
