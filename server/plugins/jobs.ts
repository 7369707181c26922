/**
 * Object storage and the job queue at boot: create the bucket if it is missing, start
 * pg-boss with the capture extraction and mail delivery workers, queue again any capture a crash left
 * queued or silently running (at start and every 15 s), and stop the queue gracefully on close. Fails
 * fast like the database plugin.
 */
import { databaseUrl } from '../db/sequelize'
import { requeueStrandedCaptures } from '../domain/captures'
import { extractCapture } from '../jobs/capture-extract'
import { startQueue, stopQueue } from '../jobs/queue'
import { useStorage } from '../storage/s3'
import { deliverMail } from '../mail/send'
import { requestPasswordReset } from '../domain/accounts'

export default defineNitroPlugin((nitroApp) => {
  const ready = (async () => {
    await useStorage().ensureBucket()
    await startQueue(useRuntimeConfig().databaseUrl || databaseUrl(), { extractCapture, deliverMail, resetRequest: requestPasswordReset })
    await requeueStrandedCaptures()
  })()
  const sweep = setInterval(() => {
    requeueStrandedCaptures().catch((err) => console.error('[bitslack] capture re-queue sweep failed:', err instanceof Error ? err.message : err))
  }, 15_000)
  sweep.unref()
  ready.catch((err) => {
    console.error('[bitslack] storage or job queue unavailable at start:', err instanceof Error ? err.message : err)
    process.exit(1)
  })
  nitroApp.hooks.hook('close', async () => {
    clearInterval(sweep)
    await ready.catch(() => undefined)
    await stopQueue()
  })
})
