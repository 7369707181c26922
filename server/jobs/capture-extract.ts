/**
 * The capture extraction job: stream the object from storage through the capture reader
 * and extractor (server/captures), report progress on the row, store the result and the
 * display waveform. A file that turns out to be malformed past the part checked at upload
 * ends as status "failed" with the message naming the line, and its object is removed.
 * Any other error (storage or database unreachable) is thrown so the queue retries; after
 * the last attempt the capture is marked failed with that error.
 */
import { summariseCaptureResult } from '../../shared/utils/capture-summary'
import { analyseCaptureStream } from '../captures/analyse'
import { CaptureFormatError } from '../captures/errors'
import { Capture } from '../db/models'
import { useStorage } from '../storage/s3'

export async function extractCapture(captureId: number, opts: { lastAttempt?: boolean } = {}): Promise<void> {
  const capture = await Capture.findByPk(captureId)
  if (!capture || capture.status === 'done' || capture.status === 'failed') return
  await capture.update({ status: 'running', progress: 0, error: null })
  // a heartbeat while the file is read: a worker silent for longer was interrupted (requeueStrandedCaptures)
  const heartbeat = setInterval(() => {
    Capture.sequelize!.query("UPDATE captures SET updated_at = now() WHERE id = :id AND status = 'running'", { replacements: { id: captureId } }).catch(() => undefined)
  }, 10_000)
  try {
    await analyse(capture)
  } catch (err) {
    // the queue retries; after the last attempt the user sees why instead of "running" forever
    if (opts.lastAttempt) await capture.update({ status: 'failed', error: `the extraction failed after several attempts: ${err instanceof Error ? err.message : String(err)}` })
    throw err
  } finally {
    clearInterval(heartbeat)
  }
}

async function analyse(capture: Capture): Promise<void> {
  const captureId = capture.id
  const { body, size } = await useStorage().stream(capture.objectKey)
  const total = size || Number(capture.size) || 1
  let reported = 0
  let lastWrite = Date.now()
  let pending: Promise<unknown> = Promise.resolve()
  const onProgress = (bytes: number) => {
    const p = Math.min(0.99, bytes / total)
    // at most one write per 5 % or per second
    if (p - reported >= 0.05 || (Date.now() - lastWrite > 1000 && p > reported)) {
      reported = p
      lastWrite = Date.now()
      pending = pending.then(() => Capture.update({ progress: p }, { where: { id: captureId } }))
    }
  }
  try {
    const o = capture.options
    const { result, waveform } = await analyseCaptureStream(body, {
      onProgress,
      input: o.input,
      ...(o.output !== undefined ? { output: o.output } : {}),
      ...(o.inverting !== undefined ? { inverting: o.inverting } : {}),
    })
    await pending
    await capture.update({ status: 'done', progress: 1, result, summary: summariseCaptureResult(result), waveform, error: null })
  } catch (err) {
    body.destroy()
    await pending.catch(() => undefined)
    if (err instanceof CaptureFormatError) {
      await capture.update({ status: 'failed', progress: 1, error: err.message })
      await useStorage().remove(capture.objectKey)
      return
    }
    throw err
  }
}
