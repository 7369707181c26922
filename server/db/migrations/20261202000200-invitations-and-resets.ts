import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * Invitations to a team and password-reset tokens. Both store only the SHA-256 of the
 * e-mailed token, so a leaked table grants nothing; both expire and are single-use.
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('invitations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.STRING(16), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('invitations', ['team_id'])
  await qi.sequelize.query(
    "ALTER TABLE invitations ADD CONSTRAINT invitations_role_check CHECK (role IN ('admin','engineer','reviewer','viewer'))",
  )

  await qi.createTable('password_reset_tokens', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('password_reset_tokens', ['user_id'])
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('password_reset_tokens')
  await qi.dropTable('invitations')
}
