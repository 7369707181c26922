/**
 * Migrations and seeders with umzug, run from scripts/db.ts before the server starts
 * (never inside the Nitro bundle, where a filename glob finds nothing).
 */
import { fileURLToPath } from 'node:url'
import path from 'node:path'
import type { QueryInterface, Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug } from 'umzug'

export type Migration = (params: { context: QueryInterface }) => Promise<void>

const here = path.dirname(fileURLToPath(import.meta.url))

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: { glob: ['migrations/*.ts', { cwd: here }] },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
}
