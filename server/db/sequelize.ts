/**
 * One Sequelize instance per process, built from DATABASE_URL (or the project-local
 * cluster's default URL). `pg` is passed as the dialect module so the bundled Nitro
 * server finds the driver.
 */
import pg from 'pg'
import { Sequelize } from 'sequelize'
import { dbPoolSizes } from '../utils/settings'

/** Default URL of the project-local cluster started by scripts/pg.sh. */
export function databaseUrl(): string {
  const port = process.env.BITSLACK_PG_PORT || '54329'
  const db = process.env.BITSLACK_PG_DB || 'bitslack'
  return process.env.DATABASE_URL || `postgres://postgres@127.0.0.1:${port}/${db}`
}

export function createSequelize(url = databaseUrl()): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: dbPoolSizes().requests, min: 0, idle: 10_000, acquire: 10_000 },
    define: { underscored: true },
  })
}
