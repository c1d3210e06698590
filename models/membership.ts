import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { ROLES, type Role } from '../lib/api/contract';
import type { User } from './user';
import type { Team } from './team';

/** A user's role in a team; one row per (team, user). */
export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  declare userId: string;
  declare role: Role;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User>;
  declare team?: NonAttribute<Team>;

  static initModel(sequelize: Sequelize): typeof Membership {
    Membership.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        teamId: { type: DataTypes.UUID, allowNull: false },
        userId: { type: DataTypes.UUID, allowNull: false },
        role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'membership', tableName: 'memberships' },
    );
    return Membership;
  }
}
