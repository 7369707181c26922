import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Role } from '../../../shared/schemas/roles'
import type { Team } from './team'
import type { User } from './user'

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<number>
  declare teamId: ForeignKey<number>
  declare role: Role
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  /** loaded by `include` (associations in ./index.ts) */
  declare user?: NonAttribute<User>
  declare team?: NonAttribute<Team>

  static initModel(sequelize: Sequelize) {
    Membership.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        role: { type: DataTypes.STRING(16), allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'memberships' },
    )
  }
}
