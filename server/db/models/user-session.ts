import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** One signed-in browser: the SHA-256 of the token its sealed cookie holds, and when it was last seen. */
export class UserSession extends Model<InferAttributes<UserSession>, InferCreationAttributes<UserSession>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<number>
  declare tokenHash: string
  declare userAgent: string
  declare ip: string
  declare createdAt: CreationOptional<Date>
  declare lastSeenAt: Date

  static initModel(sequelize: Sequelize) {
    UserSession.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
        userAgent: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        ip: { type: DataTypes.STRING(64), allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        lastSeenAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'user_sessions', updatedAt: false },
    )
  }
}
