/**
 * Global setup of the integration and browser tiers: seed the built-in parts, start the SMTP fake
 * (tests/support/mail-fake.ts), then the built server (BITSLACK_OUTPUT_DIR/server/index.mjs,
 * built by scripts/test.sh) against the throwaway database and that fake, wait until
 * /api/health answers, and stop both afterwards. The S3 fake (tests/support/storage-fake.ts)
 * runs here too; its settings go to the server and to the tests (`inject('storage')`).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import type { TestProject } from 'vitest/node'
import { createSequelize } from '../../server/db/sequelize'
import { initModels } from '../../server/db/models'
import { seedBuiltInParts } from '../../server/db/seeders/demo'
import { startMailFake, type MailFake } from '../support/mail-fake'
import { startStorageFake, type StorageFake } from '../support/storage-fake'

const port = Number(process.env.BITSLACK_TEST_PORT || 3100)
const baseURL = `http://127.0.0.1:${port}`

let server: ChildProcess | undefined
let mailFake: MailFake | undefined
let storageFake: StorageFake | undefined

export async function setup(project: TestProject) {
  if (!process.env.DATABASE_URL) throw new Error('DATABASE_URL is not set: run the suite through npm test')
  // the built-in part library, as every deployment's seed inserts it
  const sequelize = createSequelize(process.env.DATABASE_URL)
  initModels(sequelize)
  try {
    await seedBuiltInParts()
  } finally {
    await sequelize.close()
  }
  mailFake = await startMailFake()
  storageFake = await startStorageFake()
  // test files that start a spare server of their own (tests/integration/faults) inherit it
  Object.assign(process.env, storageFake.env)
  const output = process.env.BITSLACK_OUTPUT_DIR || '.output'
  server = spawn(process.execPath, [`${output}/server/index.mjs`], {
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      NODE_ENV: 'production',
      APP_URL: baseURL,
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(mailFake.smtpPort),
      SMTP_FROM: 'Bitslack <no-reply@bitslack.test>',
      // tests give each rate-limit case its own client address through X-Forwarded-For
      BITSLACK_TRUST_PROXY: '1',
      ...storageFake.env,
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  })
  const deadline = Date.now() + 60_000
  for (;;) {
    if (server.exitCode !== null) throw new Error(`the server exited with code ${server.exitCode}`)
    try {
      const res = await fetch(`${baseURL}/api/health`)
      if (res.ok) break
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('the server did not answer /api/health within 60 s')
    await new Promise((r) => setTimeout(r, 200))
  }
  project.provide('baseURL', baseURL)
  project.provide('mailURL', mailFake.url)
  project.provide('storage', storageFake.env)
}

export async function teardown() {
  if (server && server.exitCode === null) {
    server.kill('SIGTERM')
    await new Promise((r) => server!.once('exit', r))
  }
  await mailFake?.close()
  await storageFake?.close()
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    /** the SMTP fake's loopback endpoint (tests/support/mail.ts) */
    mailURL: string
    /** the S3 fake's settings as the server got them (tests/support/storage-fake.ts) */
    storage: Record<'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY', string>
  }
}
