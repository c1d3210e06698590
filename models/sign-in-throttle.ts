import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/**
 * Failed password sign-ins per e-mail address (also for addresses with no account, so the limit
 * does not reveal which addresses exist). Updated with single atomic statements in lib/auth.
 */
export class SignInThrottle extends Model<InferAttributes<SignInThrottle>, InferCreationAttributes<SignInThrottle>> {
  declare email: string;
  /** Failures counted since `windowStartedAt`. */
  declare failures: number;
  declare windowStartedAt: Date;
  /** While in the future, password sign-in for this address is refused. */
  declare lockedUntil: Date | null;

  static initModel(sequelize: Sequelize): typeof SignInThrottle {
    SignInThrottle.init(
      {
        email: { type: DataTypes.STRING(254), primaryKey: true },
        failures: { type: DataTypes.INTEGER, allowNull: false },
        windowStartedAt: { type: DataTypes.DATE, allowNull: false },
        lockedUntil: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, modelName: 'signInThrottle', tableName: 'sign_in_throttles', timestamps: false },
    );
    return SignInThrottle;
  }
}
