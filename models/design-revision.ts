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
 * One saved state of a design. Rows are only ever inserted: a save writes revision n+1 and
 * nothing updates a revision in place (the model has no updatedAt on purpose).
 */
export class DesignRevision extends Model<InferAttributes<DesignRevision>, InferCreationAttributes<DesignRevision>> {
  declare id: CreationOptional<string>;
  declare designId: string;
  /** 1, 2, 3… per design; unique with designId. */
  declare number: number;
  /** The canvas document (lib/circuit/document/schema.ts) as JSONB. */
  declare document: unknown;
  declare authorId: string;
  declare message: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare author?: NonAttribute<User>;

  static initModel(sequelize: Sequelize): typeof DesignRevision {
    DesignRevision.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        designId: { type: DataTypes.UUID, allowNull: false },
        number: { type: DataTypes.INTEGER, allowNull: false },
        document: { type: DataTypes.JSONB, allowNull: false },
        authorId: { type: DataTypes.UUID, allowNull: false },
        message: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'designRevision', tableName: 'design_revisions', updatedAt: false },
    );
    return DesignRevision;
  }
}
