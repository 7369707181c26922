import type { Sequelize } from 'sequelize'
import { createSequelize } from '../db/sequelize'
import { initModels } from '../db/models'

let instance: Sequelize | undefined

/** The process's Sequelize instance with every model initialised (created on first use). */
export function useDb(): Sequelize {
  if (!instance) {
    instance = createSequelize(useRuntimeConfig().databaseUrl || undefined)
    initModels(instance)
  }
  return instance
}

/** True when the database answers a trivial query within the pool's acquire timeout. */
export async function databaseAnswers(): Promise<boolean> {
  try {
    await useDb().query('SELECT 1')
    return true
  } catch {
    return false
  }
}
