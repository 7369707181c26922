import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A sign-up waiting for the owner of the address to confirm it (the mailed token's SHA-256). */
export class PendingSignUp extends Model<InferAttributes<PendingSignUp>, InferCreationAttributes<PendingSignUp>> {
  declare id: CreationOptional<number>
  declare tokenHash: string
  declare email: string
  declare name: string
  declare teamName: string
  declare passwordHash: string
  declare expiresAt: Date
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    PendingSignUp.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
        email: { type: DataTypes.STRING(254), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        teamName: { type: DataTypes.STRING(120), allowNull: false },
        passwordHash: { type: DataTypes.STRING(300), allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'pending_sign_ups', updatedAt: false },
    )
  }
}
