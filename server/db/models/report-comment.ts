import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { CommentTarget } from '../../../shared/schemas/report'
import type { User } from './user'

/** A comment on a revision as a whole, or on one bit, check or stage of it. */
export class ReportComment extends Model<InferAttributes<ReportComment>, InferCreationAttributes<ReportComment>> {
  declare id: CreationOptional<number>
  declare revisionId: number
  declare authorId: number | null
  declare target: CommentTarget
  declare body: string
  declare createdAt: CreationOptional<Date>
  declare author?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    ReportComment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        revisionId: { type: DataTypes.INTEGER, allowNull: false },
        authorId: { type: DataTypes.INTEGER, allowNull: true },
        target: { type: DataTypes.JSONB, allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_comments', updatedAt: false },
    )
  }
}
