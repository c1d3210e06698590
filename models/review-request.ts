import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { ReviewDto } from '../lib/api/contract';
import type { User } from './user';

/** States of a review request; only 'open' ever changes (to one of the others). */
export const REVIEW_STATES = ['open', 'approved', 'changes_requested', 'withdrawn', 'superseded'] as const satisfies readonly ReviewDto['state'][];
export type ReviewState = (typeof REVIEW_STATES)[number];

/**
 * A request that colleagues review one revision of a design. At most one request per design is
 * open (a partial unique index); a new request supersedes it. The decision is written onto the
 * row when it leaves 'open'.
 */
export class ReviewRequest extends Model<InferAttributes<ReviewRequest>, InferCreationAttributes<ReviewRequest>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  /** The revision number under review. */
  declare revision: number;
  declare requestedById: string;
  declare note: CreationOptional<string>;
  declare state: CreationOptional<ReviewState>;
  declare decidedById: CreationOptional<string | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare decisionNote: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare requestedBy?: NonAttribute<User>;
  declare decidedBy?: NonAttribute<User | null>;
  declare reviewers?: NonAttribute<User[]>;

  static initModel(sequelize: Sequelize): typeof ReviewRequest {
    ReviewRequest.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        revision: { type: DataTypes.INTEGER, allowNull: false },
        requestedById: { type: DataTypes.UUID, allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        state: { type: DataTypes.ENUM(...REVIEW_STATES), allowNull: false, defaultValue: 'open' },
        decidedById: { type: DataTypes.UUID, allowNull: true, defaultValue: null },
        decidedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
        decisionNote: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'reviewRequest', tableName: 'review_requests' },
    );
    return ReviewRequest;
  }
}

/** One reviewer named on a review request (join table). */
export class ReviewRequestReviewer extends Model<InferAttributes<ReviewRequestReviewer>, InferCreationAttributes<ReviewRequestReviewer>> {
  declare reviewRequestId: string;
  declare userId: string;

  static initModel(sequelize: Sequelize): typeof ReviewRequestReviewer {
    ReviewRequestReviewer.init(
      {
        reviewRequestId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
        userId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
      },
      { sequelize, modelName: 'reviewRequestReviewer', tableName: 'review_request_reviewers', timestamps: false },
    );
    return ReviewRequestReviewer;
  }
}
