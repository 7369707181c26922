import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * API tokens: a user's named tokens for scripts and CI, each scoped to one team and to read
 * or analyse-and-edit, with an optional expiry. Only the token's SHA-256 is stored; a revoked
 * token's row is deleted (the audit log keeps its history).
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('api_tokens', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(80), allowNull: false },
    scope: { type: DataTypes.STRING(8), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: true },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.addIndex('api_tokens', ['user_id'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('api_tokens')
}
