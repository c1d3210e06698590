import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { OfferDto } from '../lib/api/contract';
import type { Design } from './design';
import type { User } from './user';

/** States of an offer back; only 'open' ever changes. */
export const OFFER_STATES = ['open', 'accepted', 'declined', 'withdrawn'] as const satisfies readonly OfferDto['state'][];
export type OfferState = (typeof OFFER_STATES)[number];

/**
 * A fork's revision offered back to the design it was forked from. `parentBaseRevision` is the
 * parent's latest revision when the offer was made; accepting writes the fork's document as the
 * parent's next revision (`resultingRevision`). At most one offer per fork is open.
 */
export class ForkOffer extends Model<InferAttributes<ForkOffer>, InferCreationAttributes<ForkOffer>> {
  declare id: CreationOptional<string>;
  declare forkDesignId: string;
  declare forkRevision: number;
  declare parentDesignId: string;
  declare parentBaseRevision: number;
  declare offeredById: string;
  declare message: CreationOptional<string>;
  declare state: CreationOptional<OfferState>;
  declare decidedById: CreationOptional<string | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare decisionNote: CreationOptional<string | null>;
  declare resultingRevision: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare fork?: NonAttribute<Design>;
  declare parent?: NonAttribute<Design>;
  declare offeredBy?: NonAttribute<User>;
  declare decidedBy?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize): typeof ForkOffer {
    ForkOffer.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        forkDesignId: { type: DataTypes.UUID, allowNull: false },
        forkRevision: { type: DataTypes.INTEGER, allowNull: false },
        parentDesignId: { type: DataTypes.UUID, allowNull: false },
        parentBaseRevision: { type: DataTypes.INTEGER, allowNull: false },
        offeredById: { type: DataTypes.UUID, allowNull: false },
        message: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        state: { type: DataTypes.ENUM(...OFFER_STATES), allowNull: false, defaultValue: 'open' },
        decidedById: { type: DataTypes.UUID, allowNull: true, defaultValue: null },
        decidedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
        decisionNote: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
        resultingRevision: { type: DataTypes.INTEGER, allowNull: true, defaultValue: null },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'forkOffer', tableName: 'fork_offers' },
    );
    return ForkOffer;
  }
}
