import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * The audit log (written in the same transaction as each change it records) and the
 * sign-in attempts that the rate limiter counts (per address and per client IP).
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('audit_log', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    user_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    action: { type: DataTypes.STRING(64), allowNull: false },
    entity: { type: DataTypes.STRING(32), allowNull: false },
    entity_id: { type: DataTypes.INTEGER, allowNull: true },
    detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  })
  await qi.addIndex('audit_log', ['team_id', 'at'])

  await qi.createTable('sign_in_attempts', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    ip: { type: DataTypes.STRING(64), allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  })
  await qi.addIndex('sign_in_attempts', ['email', 'at'])
  await qi.addIndex('sign_in_attempts', ['ip', 'at'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('sign_in_attempts')
  await qi.dropTable('audit_log')
}
