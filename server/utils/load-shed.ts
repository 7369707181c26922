/**
 * Staying answerable under overload: heavy requests (engine work, PDF and CSV reports,
 * uploads, page renders) pass through a gate per server process with a fixed number of
 * places and a short, bounded waiting line. A request that finds the line full, or waits
 * longer than the line allows, gets 503 with Retry-After at once, so the process never
 * builds an unbounded queue and light routes (/api/health, sign-in, reads) keep answering.
 */
import { createError, type H3Event } from 'h3'

export interface GateSettings {
  /** heavy requests served at once */
  concurrency: number
  /** heavy requests allowed to wait for a place */
  queue: number
  /** the longest wait for a place, milliseconds */
  waitMs: number
}

export function gateSettings(): GateSettings {
  const n = (name: string, fallback: number, min: number) => {
    const v = Number(process.env[name])
    return Number.isInteger(v) && v >= min ? v : fallback
  }
  return {
    concurrency: n('BITSLACK_HEAVY_CONCURRENCY', 6, 1),
    queue: n('BITSLACK_HEAVY_QUEUE', 24, 0),
    waitMs: n('BITSLACK_HEAVY_WAIT_MS', 8000, 1),
  }
}

/** A counting semaphore with a bounded, timed waiting line. */
export class Gate {
  private busy = 0
  private readonly waiting: (() => void)[] = []

  constructor(private readonly s: GateSettings) {}

  /**
   * Take a place (resolves with its release), or refuse with 503 when the line is full or the
   * wait too long. `gone` is the client going away: a request whose client left while it
   * waited leaves the line (it would otherwise take a place that nobody ever gives back).
   */
  async enter(gone?: AbortSignal): Promise<() => void> {
    if (gone?.aborted) throw goneError()
    if (this.busy < this.s.concurrency) {
      this.busy++
      return this.releaser()
    }
    if (this.waiting.length >= this.s.queue) throw busyError()
    return new Promise((resolve, reject) => {
      const leave = (err: Error) => {
        clearTimeout(timer)
        gone?.removeEventListener('abort', onGone)
        const i = this.waiting.indexOf(wake)
        if (i >= 0) this.waiting.splice(i, 1)
        reject(err)
      }
      const wake = () => {
        clearTimeout(timer)
        gone?.removeEventListener('abort', onGone)
        this.busy++
        resolve(this.releaser())
      }
      const onGone = () => leave(goneError())
      const timer = setTimeout(() => leave(busyError()), this.s.waitMs)
      gone?.addEventListener('abort', onGone, { once: true })
      this.waiting.push(wake)
    })
  }

  get load() {
    return { busy: this.busy, waiting: this.waiting.length }
  }

  private releaser(): () => void {
    let done = false
    return () => {
      if (done) return
      done = true
      this.busy--
      this.waiting.shift()?.()
    }
  }
}

function goneError() {
  return createError({ statusCode: 499, statusMessage: 'the client closed the request' })
}

function busyError() {
  return createError({ statusCode: 503, statusMessage: 'the server is busy: try again in a moment', data: { retryAfter: 2 } })
}

export type HeavyKind = 'compute' | 'page'

/**
 * Which gate a request passes: 'compute' (engine work, report documents, uploads and
 * imports), 'page' (a page render), or none. Pages and API calls have gates of their own,
 * because a page render calls the API in-process: one gate would let renders hold every
 * place while their own API calls wait for one.
 */
export function heavyKind(event: H3Event): HeavyKind | null {
  const path = event.path.split('?')[0]!
  const method = event.method
  if (path.startsWith('/api/')) {
    if (path.startsWith('/api/analyze')) return 'compute'
    if (/^\/api\/links\/\d+\/analysis$/.test(path) || /^\/api\/reports\/\d+\/recompute$/.test(path)) return 'compute'
    if (method === 'POST' && (/\/captures$/.test(path) || /\/datasheets$/.test(path) || /\/links\/import$/.test(path) || /\/reports$/.test(path))) return 'compute'
    return null
  }
  if (/^\/reports\/\d+\/(report\.pdf|tables\.csv)$/.test(path)) return 'compute'
  // a page render: not a built asset, font or file download
  if (method !== 'GET' || path.startsWith('/_nuxt/') || path.startsWith('/fonts/') || path.startsWith('/__nuxt') || /\.[a-z0-9]+$/i.test(path)) return null
  return /^\/(captures|datasheets)\/\d+\/file$/.test(path) ? null : 'page'
}

const gates = new Map<HeavyKind, Gate>()
/** The process's gate for one kind of heavy request. */
export function heavyGate(kind: HeavyKind): Gate {
  let gate = gates.get(kind)
  if (!gate) gates.set(kind, (gate = new Gate(gateSettings())))
  return gate
}
