/**
 * The job queue (pg-boss 10, the last major that runs on Node 20; see the stack notes).
 * One PgBoss per process, started by server/plugins/jobs.ts.
 */
import PgBoss from 'pg-boss'

/** Extract the edges of one uploaded capture: data { captureId }. */
export const CAPTURE_EXTRACT = 'capture-extract'

let boss: PgBoss | undefined

/** Attempts of one extraction: the first and RETRY_LIMIT retries. */
const RETRY_LIMIT = 2

export async function startQueue(connectionString: string, handlers: { extractCapture: (captureId: number, opts: { lastAttempt: boolean }) => Promise<void> }): Promise<PgBoss> {
  const b = new PgBoss({ connectionString, max: 4, application_name: 'bitslack-jobs' })
  b.on('error', (err) => console.error('[bitslack] job queue:', err instanceof Error ? err.message : err))
  await b.start()
  // stately: at most one queued and one running job per capture (singletonKey), so a
  // re-send after a crash or by a second instance never runs the same capture twice at once
  await b.createQueue(CAPTURE_EXTRACT, { name: CAPTURE_EXTRACT, policy: 'stately', retryLimit: RETRY_LIMIT, retryDelay: 5, expireInSeconds: 15 * 60 })
  await b.work<{ captureId: number }>(CAPTURE_EXTRACT, { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true }, async ([job]) => {
    if (job) await handlers.extractCapture(job.data.captureId, { lastAttempt: job.retryCount >= RETRY_LIMIT })
  })
  boss = b
  return b
}

/**
 * Queue the extraction of a capture (idempotent while one is queued). Before the queue
 * has started (the first second of a boot) this does nothing: the capture row is
 * "queued" and the plugin's sweep sends it once the queue is up.
 */
export async function enqueueCaptureExtraction(captureId: number): Promise<void> {
  if (!boss) return
  await boss.send(CAPTURE_EXTRACT, { captureId }, { singletonKey: `capture-${captureId}` })
}

export async function stopQueue(): Promise<void> {
  const b = boss
  boss = undefined
  await b?.stop({ graceful: true, timeout: 10_000, wait: true })
}
