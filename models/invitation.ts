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

/**
 * An invitation to join a team with a role. Only the SHA-256 of the mailed token is stored, so
 * a database leak does not hand out working accept links.
 */
export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<string>;
  declare teamId: string;
  /** Lower-case address the invitation is for. */
  declare email: string;
  declare role: Role;
  /** Hex SHA-256 of the token in the accept link. */
  declare tokenHash: string;
  declare invitedById: string;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare acceptedById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare invitedBy?: NonAttribute<User>;
  declare team?: NonAttribute<Team>;

  static initModel(sequelize: Sequelize): typeof Invitation {
    Invitation.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        teamId: { type: DataTypes.UUID, allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false },
        role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
        tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        invitedById: { type: DataTypes.UUID, allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        acceptedAt: { type: DataTypes.DATE, allowNull: true },
        acceptedById: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'invitation', tableName: 'invitations' },
    );
    return Invitation;
  }
}
