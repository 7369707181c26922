import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { User } from './user'

/** One row of the audit log: who did what to which entity, written with the change. */
export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<number>
  declare teamId: number
  declare userId: number | null
  declare action: string
  declare entity: string
  declare entityId: number | null
  declare detail: CreationOptional<Record<string, unknown>>
  declare at: CreationOptional<Date>
  declare user?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    AuditEntry.init(
      {
        // BIGINT comes back from pg as a string; ids stay far below 2^53
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true, get() { return Number(this.getDataValue('id')) } },
        teamId: { type: DataTypes.INTEGER, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        action: { type: DataTypes.STRING(64), allowNull: false },
        entity: { type: DataTypes.STRING(32), allowNull: false },
        entityId: { type: DataTypes.INTEGER, allowNull: true },
        detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'audit_log', timestamps: false },
    )
  }
}
