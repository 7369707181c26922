import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * The team's engineering policy (issue 17): the margin and slack new links require, the
 * thin thresholds the screens mark amber, and the guard band a recommended sweep row keeps.
 * A row without a policy uses the defaults of shared/schemas/team.ts.
 */
export const up: Migration = async ({ context: qi }) => {
  await qi.addColumn('teams', 'policy', { type: DataTypes.JSONB, allowNull: false, defaultValue: {} })
  await qi.addColumn('teams', 'version', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
}

export const down: Migration = async ({ context: qi }) => {
  await qi.removeColumn('teams', 'version')
  await qi.removeColumn('teams', 'policy')
}
