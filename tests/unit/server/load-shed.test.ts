/** The heavy-request gate: a fixed number of places, a bounded and timed waiting line, 503 beyond. */
import { describe, expect, it } from 'vitest'
import { Gate } from '../../../server/utils/load-shed'

const refused = (p: Promise<unknown>) => p.then(() => 'entered', (e: { statusCode?: number }) => e.statusCode)

describe('Gate', () => {
  it('lets `concurrency` in, queues `queue` more, and refuses the rest with 503 at once', async () => {
    const gate = new Gate({ concurrency: 2, queue: 1, waitMs: 10_000 })
    const r1 = await gate.enter()
    await gate.enter()
    const waiting = gate.enter()
    expect(await refused(gate.enter())).toBe(503)
    expect(gate.load).toEqual({ busy: 2, waiting: 1 })
    r1()
    r1() // a second release of the same place changes nothing
    await waiting
    expect(gate.load).toEqual({ busy: 2, waiting: 0 })
  })

  it('a request that waits longer than waitMs is refused and leaves the line', async () => {
    const gate = new Gate({ concurrency: 1, queue: 5, waitMs: 20 })
    await gate.enter()
    expect(await refused(gate.enter())).toBe(503)
    expect(gate.load).toEqual({ busy: 1, waiting: 0 })
  })

  it('with no waiting line, the first request beyond the places is refused', async () => {
    const gate = new Gate({ concurrency: 1, queue: 0, waitMs: 1000 })
    const release = await gate.enter()
    expect(await refused(gate.enter())).toBe(503)
    release()
    expect(await refused(gate.enter())).toBe('entered')
  })

  it('a request whose client goes away while it waits leaves the line and never takes a place', async () => {
    // common practice: a load shedder must not leak places to requests nobody waits for
    const gate = new Gate({ concurrency: 1, queue: 5, waitMs: 10_000 })
    const release = await gate.enter()
    const gone = new AbortController()
    const waiting = refused(gate.enter(gone.signal))
    expect(gate.load).toEqual({ busy: 1, waiting: 1 })
    gone.abort()
    expect(await waiting).toBe(499)
    expect(gate.load).toEqual({ busy: 1, waiting: 0 })
    release()
    expect(gate.load).toEqual({ busy: 0, waiting: 0 })
    expect(await refused(gate.enter(gone.signal))).toBe(499)
  })
})
