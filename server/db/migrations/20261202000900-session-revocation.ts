import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/** Sessions signed in before this instant are no longer valid (set by a password reset). */
export const up: Migration = async ({ context: qi }) => {
  await qi.addColumn('users', 'sessions_valid_after', { type: DataTypes.DATE, allowNull: true })
}

export const down: Migration = async ({ context: qi }) => {
  await qi.removeColumn('users', 'sessions_valid_after')
}
