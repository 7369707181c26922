/**
 * All models, initialised and associated in one place. Call `initModels` once per
 * Sequelize instance (server/utils/db.ts in the app, scripts/db.ts outside it).
 */
import type { Sequelize } from 'sequelize'
import { AuditEntry } from './audit-entry'
import { Capture } from './capture'
import { Invitation } from './invitation'
import { Link } from './link'
import { Membership } from './membership'
import { Part } from './part'
import { PartDatasheet } from './part-datasheet'
import { PasswordResetToken } from './password-reset-token'
import { Project } from './project'
import { ReportComment } from './report-comment'
import { ReportEvent } from './report-event'
import { ReportRevision } from './report-revision'
import { SignInAttempt } from './sign-in-attempt'
import { Team } from './team'
import { User } from './user'
import { UserSession } from './user-session'
import { RateEvent } from './rate-event'
import { PendingSignUp } from './pending-sign-up'
import { ApiToken } from './api-token'

export { Capture, PartDatasheet, UserSession, RateEvent, PendingSignUp, ApiToken }
export { AuditEntry, Invitation, Link, Membership, Part, PasswordResetToken, Project, ReportComment, ReportEvent, ReportRevision, SignInAttempt, Team, User }

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize)
  UserSession.initModel(sequelize)
  ApiToken.initModel(sequelize)
  RateEvent.initModel(sequelize)
  PendingSignUp.initModel(sequelize)
  Team.initModel(sequelize)
  Membership.initModel(sequelize)
  Invitation.initModel(sequelize)
  PasswordResetToken.initModel(sequelize)
  Project.initModel(sequelize)
  Link.initModel(sequelize)
  Part.initModel(sequelize)
  AuditEntry.initModel(sequelize)
  SignInAttempt.initModel(sequelize)
  Capture.initModel(sequelize)
  PartDatasheet.initModel(sequelize)
  ReportRevision.initModel(sequelize)
  ReportEvent.initModel(sequelize)
  ReportComment.initModel(sequelize)

  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  UserSession.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  ApiToken.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  ApiToken.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  Team.hasMany(Membership, { foreignKey: 'teamId', as: 'memberships' })
  Membership.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })

  Invitation.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  Invitation.belongsTo(User, { foreignKey: 'invitedBy', as: 'inviter' })
  PasswordResetToken.belongsTo(User, { foreignKey: 'userId', as: 'user' })

  // `access`: the caller's membership in the row's team. Queries include it with
  // `where: { userId }` and `required: true`, so a foreign row is simply not found.
  Project.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })
  Link.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })
  Part.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })

  Project.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  Project.hasMany(Link, { foreignKey: 'projectId', as: 'links' })
  Link.belongsTo(Project, { foreignKey: 'projectId', as: 'project' })
  Link.belongsTo(User, { foreignKey: 'updatedBy', as: 'updater', constraints: false })
  AuditEntry.belongsTo(User, { foreignKey: 'userId', as: 'user', constraints: false })

  // uploads (issue 7): scoped by their team like links and parts
  Capture.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })
  Capture.belongsTo(Link, { foreignKey: 'linkId', as: 'link' })
  Capture.belongsTo(User, { foreignKey: 'ownerId', as: 'owner', constraints: false })
  PartDatasheet.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })
  PartDatasheet.belongsTo(Part, { foreignKey: 'partId', as: 'part' })
  PartDatasheet.belongsTo(User, { foreignKey: 'ownerId', as: 'owner', constraints: false })
  // margin reports (issue 6): `access` as above, people by id, review steps and comments
  ReportRevision.hasOne(Membership, { foreignKey: 'teamId', sourceKey: 'teamId', as: 'access', constraints: false })
  ReportRevision.belongsTo(User, { foreignKey: 'authorId', as: 'author', constraints: false })
  ReportRevision.belongsTo(User, { foreignKey: 'reviewerId', as: 'reviewer', constraints: false })
  ReportRevision.belongsTo(User, { foreignKey: 'decidedBy', as: 'decider', constraints: false })
  ReportRevision.hasMany(ReportEvent, { foreignKey: 'revisionId', as: 'events' })
  ReportRevision.hasMany(ReportComment, { foreignKey: 'revisionId', as: 'comments' })
  ReportEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor', constraints: false })
  ReportEvent.belongsTo(User, { foreignKey: 'reviewerId', as: 'reviewer', constraints: false })
  ReportComment.belongsTo(User, { foreignKey: 'authorId', as: 'author', constraints: false })
  return { ReportRevision, ReportEvent, ReportComment, User, Team, Membership, Invitation, PasswordResetToken, Project, Link, Part, AuditEntry, SignInAttempt }
}
