import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/**
 * Projects, links and the part library. A link's whole definition is one JSONB document
 * validated by shared/schemas/link.ts (the one source of truth: channels and stages live
 * inside it); `summary` caches the analysis computed at save time for the project page.
 * `version` is the optimistic-locking counter: an UPDATE names the version it was based on.
 * Parts with team_id NULL are the built-in, read-only library.
 */
export const up: Migration = async ({ context: qi }) => {
  const people = {
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    updated_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
  }
  const stamps = {
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  }
  await qi.createTable('projects', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(200), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    ...people,
    ...stamps,
  })
  await qi.addIndex('projects', ['team_id'])

  await qi.createTable('links', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    project_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'projects', key: 'id' }, onDelete: 'CASCADE' },
    // the project's team, kept on the row so ownership is one join in every WHERE clause
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(200), allowNull: false },
    protocol: { type: DataTypes.STRING(16), allowNull: false },
    spec: { type: DataTypes.JSONB, allowNull: false },
    summary: { type: DataTypes.JSONB, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    ...people,
    ...stamps,
  })
  await qi.addIndex('links', ['project_id'])
  await qi.addIndex('links', ['team_id'])

  await qi.createTable('parts', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    category: { type: DataTypes.STRING(40), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    stage: { type: DataTypes.JSONB, allowNull: false },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    ...people,
    ...stamps,
  })
  await qi.addIndex('parts', ['team_id'])
  // one built-in part per name (the seed is idempotent on it)
  await qi.sequelize.query('CREATE UNIQUE INDEX parts_built_in_name ON parts (name) WHERE team_id IS NULL')
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('parts')
  await qi.dropTable('links')
  await qi.dropTable('projects')
}
