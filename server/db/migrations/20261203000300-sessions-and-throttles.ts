import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * Sessions that end and throttles that cannot lock anyone out (issue 13):
 * - user_sessions: one row per sign-in; the sealed cookie holds the session's token, the
 *   row only its SHA-256; sign-out deletes the row; lifetime and idle timeout are checked
 *   against created_at / last_seen_at on every request;
 * - rate_events: one row per throttled event (sign-up, reset request, invitation accept),
 *   counted per bucket and key within a window, shared by every server process;
 * - pending_sign_ups: a sign-up waits for the owner of the address to confirm it by mail,
 *   so the answer to a sign-up never says whether the address has an account.
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('user_sessions', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    user_agent: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
    ip: { type: DataTypes.STRING(64), allowNull: false, defaultValue: '' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    last_seen_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('user_sessions', ['user_id'])
  await qi.createTable('rate_events', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    bucket: { type: DataTypes.STRING(40), allowNull: false },
    key: { type: DataTypes.STRING(300), allowNull: false },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: qi.sequelize.literal('now()') },
  })
  await qi.addIndex('rate_events', ['bucket', 'key', 'at'])
  await qi.addIndex('sign_in_attempts', ['email', 'ip', 'at'])
  await qi.createTable('pending_sign_ups', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    team_name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(300), allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('pending_sign_ups')
  await qi.removeIndex('sign_in_attempts', ['email', 'ip', 'at'])
  await qi.dropTable('rate_events')
  await qi.dropTable('user_sessions')
}
