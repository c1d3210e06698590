import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { ActivityKind, MailKind } from '../lib/api/contract';
import type { Design } from './design';
import type { User } from './user';

/** One thing that happened in a team (a review asked for, a comment, an offer…) with the path to it. */
export class ActivityEvent extends Model<InferAttributes<ActivityEvent>, InferCreationAttributes<ActivityEvent>> {
  declare id: CreationOptional<string>;
  declare kind: ActivityKind;
  declare teamId: string;
  declare designId: string | null;
  declare actorId: string;
  declare summary: string;
  declare path: string;
  declare createdAt: CreationOptional<Date>;
  declare actor?: NonAttribute<User>;
  declare design?: NonAttribute<Design | null>;
  declare recipients?: NonAttribute<ActivityRecipient[]>;

  static initModel(sequelize: Sequelize): typeof ActivityEvent {
    ActivityEvent.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        kind: { type: DataTypes.STRING(32), allowNull: false },
        teamId: { type: DataTypes.UUID, allowNull: false },
        designId: { type: DataTypes.UUID, allowNull: true },
        actorId: { type: DataTypes.UUID, allowNull: false },
        summary: { type: DataTypes.STRING(500), allowNull: false },
        path: { type: DataTypes.STRING(500), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'activityEvent', tableName: 'activity_events', updatedAt: false },
    );
    return ActivityEvent;
  }
}

/** A user an event is addressed to (it shows as "for you" in their feed). */
export class ActivityRecipient extends Model<InferAttributes<ActivityRecipient>, InferCreationAttributes<ActivityRecipient>> {
  declare eventId: string;
  declare userId: string;

  static initModel(sequelize: Sequelize): typeof ActivityRecipient {
    ActivityRecipient.init(
      {
        eventId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
        userId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
      },
      { sequelize, modelName: 'activityRecipient', tableName: 'activity_recipients', timestamps: false },
    );
    return ActivityRecipient;
  }
}

/** The mail kinds one user turned off (no row: every kind on). */
export class NotificationSetting extends Model<InferAttributes<NotificationSetting>, InferCreationAttributes<NotificationSetting>> {
  declare userId: string;
  declare muted: MailKind[];
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof NotificationSetting {
    NotificationSetting.init(
      {
        userId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
        muted: { type: DataTypes.ARRAY(DataTypes.STRING(32)), allowNull: false, defaultValue: [] },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'notificationSetting', tableName: 'notification_settings', createdAt: false },
    );
    return NotificationSetting;
  }
}
