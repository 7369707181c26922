import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { User } from './user'

/** One review step of a revision: freeze, submit (naming the reviewer), sign-off, return. */
export class ReportEvent extends Model<InferAttributes<ReportEvent>, InferCreationAttributes<ReportEvent>> {
  declare id: CreationOptional<number>
  declare revisionId: number
  declare action: 'freeze' | 'submit' | 'sign-off' | 'return'
  declare actorId: number | null
  declare reviewerId: number | null
  declare note: string | null
  declare at: CreationOptional<Date>
  declare actor?: NonAttribute<User | null>
  declare reviewer?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    ReportEvent.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        revisionId: { type: DataTypes.INTEGER, allowNull: false },
        action: { type: DataTypes.STRING(16), allowNull: false },
        actorId: { type: DataTypes.INTEGER, allowNull: true },
        reviewerId: { type: DataTypes.INTEGER, allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: true },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'report_events', timestamps: false },
    )
  }
}
