import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { ApiTokenScope } from '../../../shared/schemas/apiToken'
import type { Team } from './team'
import type { User } from './user'

/** A user's API token for one team: its name, scope and expiry, the SHA-256 of the token, and when it was last used. */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<number>
  declare teamId: ForeignKey<number>
  declare name: string
  declare scope: ApiTokenScope
  declare tokenHash: string
  declare createdAt: CreationOptional<Date>
  declare expiresAt: Date | null
  declare lastUsedAt: CreationOptional<Date | null>
  declare user?: NonAttribute<User>
  declare team?: NonAttribute<Team>

  static initModel(sequelize: Sequelize) {
    ApiToken.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.STRING(80), allowNull: false },
        scope: { type: DataTypes.STRING(8), allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
        createdAt: DataTypes.DATE,
        expiresAt: { type: DataTypes.DATE, allowNull: true },
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'api_tokens', updatedAt: false },
    )
  }
}
