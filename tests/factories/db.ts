/**
 * Direct access to the test database from a test worker, for factories: rows are
 * inserted through the real models into the real PostgreSQL the server uses.
 */
import { afterAll } from 'vitest'
import type { Sequelize } from 'sequelize'
import { createSequelize } from '../../server/db/sequelize'
import { initModels } from '../../server/db/models'

let sequelize: Sequelize | undefined

export function useTestDb(): Sequelize {
  if (!sequelize) {
    if (!process.env.DATABASE_URL) throw new Error('DATABASE_URL is not set: run the suite through npm test')
    sequelize = createSequelize(process.env.DATABASE_URL)
    initModels(sequelize)
    afterAll(async () => {
      await sequelize?.close()
      sequelize = undefined
    })
  }
  return sequelize
}
