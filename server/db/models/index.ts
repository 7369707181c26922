/**
 * All models, initialised and associated in one place. Call `initModels` once per
 * Sequelize instance (server/utils/db.ts in the app, scripts/db.ts outside it).
 */
import type { Sequelize } from 'sequelize'
import { Membership } from './membership'
import { Team } from './team'
import { User } from './user'

export { Membership, Team, User }

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize)
  Team.initModel(sequelize)
  Membership.initModel(sequelize)

  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Team.hasMany(Membership, { foreignKey: 'teamId', as: 'memberships' })
  Membership.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  return { User, Team, Membership }
}
