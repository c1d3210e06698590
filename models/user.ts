import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/**
 * A person who signs in. Shared with the next-auth adapter (which reads and writes id, name,
 * email, emailVerified, image); the password hash is left out of the default scope so that no
 * query hands it out by accident. Use `User.scope('withPassword')` to check a password.
 */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>;
  declare name: string | null;
  /** Always stored lower-case. */
  declare email: string;
  declare emailVerified: Date | null;
  declare image: string | null;
  /** bcrypt hash; null for accounts that only use sign-in links. */
  declare passwordHash: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof User {
    User.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        name: { type: DataTypes.STRING(80), allowNull: true },
        email: {
          type: DataTypes.STRING(254),
          allowNull: false,
          unique: true,
          set(value: string) {
            this.setDataValue('email', value.toLowerCase());
          },
        },
        emailVerified: { type: DataTypes.DATE, allowNull: true },
        image: { type: DataTypes.STRING(500), allowNull: true },
        passwordHash: { type: DataTypes.STRING(100), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'user',
        tableName: 'users',
        defaultScope: { attributes: { exclude: ['passwordHash'] } },
        scopes: { withPassword: { attributes: { include: ['passwordHash'] } } },
      },
    );
    return User;
  }
}
