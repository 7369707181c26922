import { DataTypes } from 'sequelize'
import type { Migration } from '../migrator'

/** Users, teams and their memberships (role per team). */
export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(255), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.createTable('teams', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.createTable('memberships', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    role: { type: DataTypes.STRING(16), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('memberships', ['user_id', 'team_id'], { unique: true })
  await qi.sequelize.query(
    "ALTER TABLE memberships ADD CONSTRAINT memberships_role_check CHECK (role IN ('admin','engineer','reviewer','viewer'))",
  )
}

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('memberships')
  await qi.dropTable('teams')
  await qi.dropTable('users')
}
