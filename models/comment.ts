import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { CommentAnchor } from '../lib/api/contract';
import type { User } from './user';

/**
 * A plain-text comment on one revision of a design, pinned to the design, a node (net name) or
 * a part; a reply has `parentId` and follows its parent's revision and anchor. `mentionIds`
 * holds the team members named with `@Full Name`.
 */
export class Comment extends Model<InferAttributes<Comment>, InferCreationAttributes<Comment>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  declare revision: number;
  declare parentId: string | null;
  declare authorId: string;
  declare body: string;
  declare anchor: CommentAnchor;
  declare mentionIds: CreationOptional<string[]>;
  declare resolvedAt: CreationOptional<Date | null>;
  declare resolvedById: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare author?: NonAttribute<User>;
  declare resolvedBy?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize): typeof Comment {
    Comment.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        parentId: { type: DataTypes.UUID, allowNull: true },
        authorId: { type: DataTypes.UUID, allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false },
        anchor: { type: DataTypes.JSONB, allowNull: false },
        mentionIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
        resolvedAt: { type: DataTypes.DATE, allowNull: true },
        resolvedById: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'comment', tableName: 'comments' },
    );
    return Comment;
  }
}
