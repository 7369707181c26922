/**
 * Database tasks outside the request path:
 *   tsx scripts/db.ts migrate        apply pending migrations
 *   tsx scripts/db.ts seed           seed the demo when the database is empty
 *   tsx scripts/db.ts down           revert the last migration
 */
import { createSequelize } from '../server/db/sequelize'
import { initModels } from '../server/db/models'
import { migrator } from '../server/db/migrator'
import { seedDemo } from '../server/db/seeders/demo'

const command = process.argv[2]
const sequelize = createSequelize()
initModels(sequelize)

try {
  if (command === 'migrate') {
    const done = await migrator(sequelize).up()
    console.log(`[db] migrations applied: ${done.length}`)
  } else if (command === 'down') {
    await migrator(sequelize).down()
    console.log('[db] last migration reverted')
  } else if (command === 'seed') {
    const seeded = await seedDemo(sequelize)
    console.log(seeded ? '[db] demo data seeded' : '[db] database not empty: demo seed skipped')
  } else {
    console.error('usage: tsx scripts/db.ts migrate|seed|down')
    process.exitCode = 2
  }
} catch (err) {
  console.error('[db]', err instanceof Error ? err.message : err)
  process.exitCode = 1
} finally {
  await sequelize.close()
}
