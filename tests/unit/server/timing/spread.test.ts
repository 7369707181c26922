import { describe, expect, it } from 'vitest'
import { analyzeLink } from '../../../../server/timing/analyze'
import { EngineInputError } from '../../../../server/timing/errors'
import { spreadStudy } from '../../../../server/timing/spread'
import { digital, LVCMOS33, ns, uartLink } from './fixtures'
import { FIELD_RS485_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK } from '../../../../server/db/seeders/demo-links'

const corners = (min: number, typ: number, max: number) => ({ min, typ, max })
const spreadLink = (baud = 115200) =>
  uartLink(
    [
      {
        ...(digital(0, 0, { jitterRms: 2 * ns, jitterPeak: 3 * ns, tr: { typ: 5 * ns, max: 10 * ns }, tf: { typ: 4 * ns, max: 8 * ns } }) as object),
        tplh: corners(20 * ns, 40 * ns, 300 * ns),
        tphl: corners(20 * ns, 30 * ns, 60 * ns),
      } as never,
    ],
    { baud, tx: { errorPpm: 15000 }, rx: { errorPpm: 15000, oversampling: 16, vote: 'majority' }, requiredMarginUi: 0.1 },
    LVCMOS33,
    [digital(30 * ns, 30 * ns)],
  )

describe('spread study', () => {
  it('is reproducible from its seed and changes with it', () => {
    const a = spreadStudy(spreadLink(), { trials: 2000, seed: 5 })
    const b = spreadStudy(spreadLink(), { trials: 2000, seed: 5 })
    const c = spreadStudy(spreadLink(), { trials: 2000, seed: 6 })
    expect(b.worstMarginUi).toEqual(a.worstMarginUi)
    expect(b.histogram).toEqual(a.histogram)
    expect(c.worstMarginUi.p50).not.toBe(a.worstMarginUi.p50)
  })

  it('no trial falls below the worst-case analysis without jitter beyond its peak', () => {
    // timing-model.md 2 and 7: the worst case bounds every realisation drawn within the same ranges,
    // except the Gaussian part of the jitter, which is unbounded: take it out here
    const link = spreadLink()
    link.channels[0]!.stages[0] = { ...link.channels[0]!.stages[0]!, jitterRms: 0 } as never
    const worst = analyzeLink(link).uart!.worstMarginUi
    const s = spreadStudy(link, { trials: 5000, seed: 9 })
    expect(s.worstMarginUi.min).toBeGreaterThanOrEqual(worst - 1e-12)
    expect(s.worstMarginUi.min).toBeLessThan(worst + 0.1) // and the tails come near it
  })

  it('counts failures and returns ordered quantiles and a full histogram', () => {
    const s = spreadStudy(spreadLink(2e6), { trials: 4000, seed: 2 })
    expect(s.failures).toBeGreaterThan(0)
    expect(s.failFraction).toBeCloseTo(s.failures / 4000, 12)
    expect(s.belowRequired).toBeGreaterThanOrEqual(s.failures)
    const q = s.worstMarginUi
    const order = [q.min, q.p1, q.p5, q.p25, q.p50, q.p75, q.p95, q.p99, q.max]
    for (let i = 1; i < order.length; i++) expect(order[i]).toBeGreaterThanOrEqual(order[i - 1]!)
    expect(s.histogram.reduce((n, b) => n + b.count, 0)).toBe(4000)
    expect(s.channels).toEqual(['a2b', 'b2a'])
  })

  it('a 100k-trial study completes and reports its own run time (npm run bench prints the figure against its goal)', () => {
    const s = spreadStudy(spreadLink(), { trials: 100000, seed: 1 })
    expect(s.trials).toBe(100000)
    expect(s.histogram.reduce((n, b) => n + b.count, 0)).toBe(100000)
    expect(s.elapsedMs).toBeGreaterThan(0)
  })

  it('an RS-485 link: the study covers its data direction, bounded by the worst-case analysis', () => {
    // the demo field-display link, jitter-free so the worst case bounds every trial (timing-model.md 2 and 7)
    const link = structuredClone(FIELD_RS485_LINK)
    const a = analyzeLink(link)
    const s = spreadStudy(link, { trials: 3000, seed: 4 })
    expect(s.channels).toEqual(['data'])
    expect(s.worstMarginUi.min).toBeGreaterThanOrEqual(a.uart!.worstMarginUi! - 1e-12)
  })

  it('refuses a link judged by worst-case slacks only (I2C, CAN), naming the protocol', () => {
    expect(() => spreadStudy(PUMP_CAN_LINK)).toThrow(/spread study covers UART and RS-485/)
    expect(() => spreadStudy(MONITOR_I2C_LINK)).toThrow(EngineInputError)
  })

  it('rejects an impossible trial count', () => {
    expect(() => spreadStudy(spreadLink(), { trials: 0 })).toThrow(EngineInputError)
  })
})
