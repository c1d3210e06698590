/**
 * All Sequelize models and their associations, bound to one Sequelize instance by
 * `initModels` (called once, from lib/db.ts). Only lib/data, lib/auth and the scripts use them.
 */
import type { Sequelize } from 'sequelize';
import { User } from './user';
import { Account, Session, VerificationToken } from './auth-tables';
import { SignInThrottle } from './sign-in-throttle';
import { Team } from './team';
import { Membership } from './membership';
import { Invitation } from './invitation';
import { Design } from './design';
import { DesignRevision } from './design-revision';
// reviews and offers
import { ReviewRequest, ReviewRequestReviewer } from './review-request';
import { Approval } from './approval';
import { ForkOffer } from './fork-offer';
// comments and activity
import { Comment } from './comment';
import { ActivityEvent, ActivityRecipient, NotificationSetting } from './activity';
// bench data (measurements on the built supply)
import { BenchDataset } from './bench-dataset';
// analyses (sweeps and spreads)
import { Analysis } from './analysis';
// audit log
import { AuditEvent } from './audit-event';
// parts library
import { Part } from './part';

export { User, Account, Session, VerificationToken, SignInThrottle, Team, Membership, Invitation, Design, DesignRevision };
// reviews and offers
export { ReviewRequest, ReviewRequestReviewer, Approval, ForkOffer };
// comments and activity
export { Comment, ActivityEvent, ActivityRecipient, NotificationSetting };
// bench data
export { BenchDataset };
// analyses (sweeps and spreads)
export { Analysis };
// audit log
export { AuditEvent };
// parts library
export { Part };

/** The model classes, initialised. */
export interface Models {
  User: typeof User;
  Account: typeof Account;
  Session: typeof Session;
  VerificationToken: typeof VerificationToken;
  SignInThrottle: typeof SignInThrottle;
  Team: typeof Team;
  Membership: typeof Membership;
  Invitation: typeof Invitation;
  Design: typeof Design;
  DesignRevision: typeof DesignRevision;
  // reviews and offers
  ReviewRequest: typeof ReviewRequest;
  ReviewRequestReviewer: typeof ReviewRequestReviewer;
  Approval: typeof Approval;
  ForkOffer: typeof ForkOffer;
  // comments and activity
  Comment: typeof Comment;
  ActivityEvent: typeof ActivityEvent;
  ActivityRecipient: typeof ActivityRecipient;
  NotificationSetting: typeof NotificationSetting;
  // bench data
  BenchDataset: typeof BenchDataset;
  // analyses (sweeps and spreads)
  Analysis: typeof Analysis;
  // audit log
  AuditEvent: typeof AuditEvent;
  // parts library
  Part: typeof Part;
}

let boundTo: Sequelize | null = null;

/** Bind every model to `sequelize` and declare the associations (idempotent per instance). */
export function initModels(sequelize: Sequelize): Models {
  const models: Models = {
    ...{ User, Account, Session, VerificationToken, SignInThrottle, Team, Membership, Invitation, Design, DesignRevision },
    // reviews and offers
    ...{ ReviewRequest, ReviewRequestReviewer, Approval, ForkOffer },
    // comments and activity
    ...{ Comment, ActivityEvent, ActivityRecipient, NotificationSetting },
    // bench data
    ...{ BenchDataset },
    // analyses (sweeps and spreads)
    ...{ Analysis },
    // audit log
    ...{ AuditEvent },
    // parts library
    ...{ Part },
  };
  if (boundTo === sequelize) return models;
  boundTo = sequelize;
  for (const m of Object.values(models)) m.initModel(sequelize);

  Account.belongsTo(User, { foreignKey: 'userId', onDelete: 'cascade' });
  Session.belongsTo(User, { foreignKey: 'userId', onDelete: 'cascade' });
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Membership.belongsTo(Team, { foreignKey: 'teamId', as: 'team' });
  Team.hasMany(Membership, { foreignKey: 'teamId', as: 'memberships' });
  Invitation.belongsTo(User, { foreignKey: 'invitedById', as: 'invitedBy' });
  Invitation.belongsTo(Team, { foreignKey: 'teamId', as: 'team' });
  Design.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  Design.belongsTo(Design, { foreignKey: 'forkedFromDesignId', as: 'forkedFrom' });
  DesignRevision.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  // reviews and offers
  ReviewRequest.belongsTo(User, { foreignKey: 'requestedById', as: 'requestedBy' });
  ReviewRequest.belongsTo(User, { foreignKey: 'decidedById', as: 'decidedBy' });
  ReviewRequest.belongsToMany(User, { through: ReviewRequestReviewer, foreignKey: 'reviewRequestId', otherKey: 'userId', as: 'reviewers' });
  Approval.belongsTo(User, { foreignKey: 'approvedById', as: 'approvedBy' });
  ForkOffer.belongsTo(Design, { foreignKey: 'forkDesignId', as: 'fork' });
  ForkOffer.belongsTo(Design, { foreignKey: 'parentDesignId', as: 'parent' });
  ForkOffer.belongsTo(User, { foreignKey: 'offeredById', as: 'offeredBy' });
  ForkOffer.belongsTo(User, { foreignKey: 'decidedById', as: 'decidedBy' });
  // comments and activity
  Comment.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  Comment.belongsTo(User, { foreignKey: 'resolvedById', as: 'resolvedBy' });
  ActivityEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  ActivityEvent.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  ActivityEvent.hasMany(ActivityRecipient, { foreignKey: 'eventId', as: 'recipients' });
  // bench data
  BenchDataset.belongsTo(User, { foreignKey: 'uploadedById', as: 'uploadedBy' });
  return models;
}
