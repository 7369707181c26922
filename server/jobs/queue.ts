/**
 * The job queue (pg-boss 10, the last major that runs on Node 20; see the stack notes).
 * One PgBoss per process, started by server/plugins/jobs.ts.
 */
import PgBoss from 'pg-boss'
import type { QueuedMail } from '../mail/types'
import { dbPoolSizes } from '../utils/settings'

/** Extract the edges of one uploaded capture: data { captureId }. */
export const CAPTURE_EXTRACT = 'capture-extract'

/** Deliver one rendered e-mail: data QueuedMail (server/mail/types.ts). */
export const MAIL_SEND = 'mail-send'

/** Look up an address asking for a password reset and mail a link when it has an account: data { email }. */
export const RESET_REQUEST = 'reset-request'

let boss: PgBoss | undefined
/** Resolves once the queue has started (mail sent during boot waits for it). */
let started: Promise<PgBoss> | undefined
let markStarted: ((b: PgBoss) => void) | undefined
const whenStarted = () => (started ??= new Promise<PgBoss>((resolve) => (markStarted = resolve)))

/** Mail delivery: retried with exponential backoff (2 s, 4 s, 8 s ... capped by pg-boss) for about a day. */
const MAIL_RETRY = { retryLimit: 25, retryDelay: 2, retryBackoff: true, expireInSeconds: 60 } as const

/** Attempts of one extraction: the first and RETRY_LIMIT retries. */
const RETRY_LIMIT = 2

/**
 * Several processes starting at once on a fresh database create the same queues at the same
 * moment; PostgreSQL then aborts one of them (deadlock 40P01, or 23505 on the queue's row).
 * Creating a queue that exists is a no-op, so the loser tries again after a short pause.
 */
async function concurrentSafe(create: () => Promise<unknown>, attempts = 6): Promise<void> {
  for (let i = 1; ; i++) {
    try {
      await create()
      return
    } catch (err) {
      const code = (err as { code?: string }).code
      if (i >= attempts || (code !== '40P01' && code !== '23505')) throw err
      await new Promise((r) => setTimeout(r, 100 * 2 ** i * (0.5 + Math.random())))
    }
  }
}

export async function startQueue(
  connectionString: string,
  handlers: {
    extractCapture: (captureId: number, opts: { lastAttempt: boolean }) => Promise<void>
    deliverMail: (mail: QueuedMail) => Promise<void>
    resetRequest: (email: string) => Promise<void>
  },
): Promise<PgBoss> {
  const b = new PgBoss({ connectionString, max: dbPoolSizes().jobs, application_name: 'bitslack-jobs' })
  b.on('error', (err) => console.error('[bitslack] job queue:', err instanceof Error ? err.message : err))
  await b.start()
  // stately: at most one queued and one running job per capture (singletonKey), so a
  // re-send after a crash or by a second instance never runs the same capture twice at once
  await concurrentSafe(() => b.createQueue(CAPTURE_EXTRACT, { name: CAPTURE_EXTRACT, policy: 'stately', retryLimit: RETRY_LIMIT, retryDelay: 5, expireInSeconds: 5 * 60 }))
  await b.work<{ captureId: number }>(CAPTURE_EXTRACT, { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true }, async ([job]) => {
    if (job) await handlers.extractCapture(job.data.captureId, { lastAttempt: job.retryCount >= RETRY_LIMIT })
  })
  await concurrentSafe(() => b.createQueue(MAIL_SEND, { name: MAIL_SEND, policy: 'standard', ...MAIL_RETRY }))
  await b.work<QueuedMail>(MAIL_SEND, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await handlers.deliverMail(job.data)
  })
  await concurrentSafe(() => b.createQueue(RESET_REQUEST, { name: RESET_REQUEST, policy: 'standard', retryLimit: 3, retryDelay: 5, expireInSeconds: 60 }))
  await b.work<{ email: string }>(RESET_REQUEST, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
    if (job) await handlers.resetRequest(job.data.email)
  })
  boss = b
  whenStarted()
  markStarted?.(b)
  return b
}

/** Queue one rendered mail for delivery (waits for the queue during boot). */
export async function enqueueMail(mail: QueuedMail): Promise<void> {
  const b = boss ?? (await whenStarted())
  await b.send(MAIL_SEND, mail, MAIL_RETRY)
}

/** Queue a password-reset request (known and unknown addresses alike). */
export async function enqueueResetRequest(email: string): Promise<void> {
  const b = boss ?? (await whenStarted())
  await b.send(RESET_REQUEST, { email }, { retryLimit: 3, retryDelay: 5, expireInSeconds: 60 })
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
