import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  caseTable,
  fixedClockCases,
  fixedClockWorstUi,
  frameLayout,
  marginAndMaxBaud,
  maxBaud,
  samplerModel,
  tableWorstUi,
  worstMarginUi,
  type MarginAndMaxBaud,
  type ReceiverEnd,
} from '../../../../server/timing/uart'

// The pull-up sweep's one-pass evaluation must give exactly what the closed forms
// worstMarginUi and maxBaud give (timing-model.md section 2), for every frame format,
// sampler, clock error interval and distortion: it only reorders when each case's
// clock part is computed.
const frameArb = fc.record({
  dataBits: fc.integer({ min: 5, max: 9 }),
  parity: fc.constantFrom('none' as const, 'even' as const, 'odd' as const, 'mark' as const, 'space' as const),
  stopBits: fc.constantFrom(1, 1.5, 2),
  backToBack: fc.boolean(),
})
const rxArb: fc.Arbitrary<ReceiverEnd> = fc.oneof(
  fc.constant<ReceiverEnd>({ sampler: 'ticks', oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority', samplePoint: 0.5 }),
  fc.constant<ReceiverEnd>({ sampler: 'ticks', oversampling: 8, sampleTicks: [3, 4, 5], vote: 'all', samplePoint: 0.5 }),
  fc.constant<ReceiverEnd>({ sampler: 'ticks', oversampling: 16, sampleTicks: [8], vote: 'single', samplePoint: 0.5 }),
  fc.double({ min: 0.05, max: 0.95, noNaN: true }).map((p): ReceiverEnd => ({ sampler: 'ideal', oversampling: 16, vote: 'single', samplePoint: p })),
)
const errArb = fc.tuple(fc.double({ min: -0.05, max: 0.05, noNaN: true }), fc.double({ min: -0.05, max: 0.05, noNaN: true })).map(([a, b]) => ({ min: Math.min(a, b), max: Math.max(a, b) }))
const distortionArb = fc.record({
  pwd: fc.tuple(fc.double({ min: -2e-6, max: 2e-6, noNaN: true }), fc.double({ min: -2e-6, max: 2e-6, noNaN: true })).map(([a, b]) => ({ min: Math.min(a, b), max: Math.max(a, b) })),
  jitterPeak: fc.oneof(fc.constant(0), fc.double({ min: 0, max: 1e-7, noNaN: true })),
  jitterRms: fc.constant(0),
})

describe('fixed-clock case evaluation (pull-up sweep)', () => {
  it('gives bit for bit the worst margin and maximum baud of the closed forms', () => {
    fc.assert(
      fc.property(
        frameArb,
        rxArb,
        errArb,
        errArb,
        fc.array(distortionArb, { minLength: 1, maxLength: 5 }),
        fc.double({ min: 1, max: 5e6, noNaN: true }),
        fc.double({ min: 0, max: 0.5, noNaN: true }),
        (f, rx, tx, rxErr, ds, baud, req) => {
          const layout = frameLayout(f.dataBits, f.parity, f.stopBits, f.backToBack)
          const s = samplerModel(rx)
          const e = { tx, rx: rxErr }
          const cases = fixedClockCases(layout, s, e)
          const out: MarginAndMaxBaud = { worstUi: 0, maxBaud: null }
          for (const d of ds) {
            marginAndMaxBaud(cases, d, baud, req, 100e6, out)
            expect(out.worstUi).toBe(worstMarginUi(layout, s, d, e, baud))
            expect(out.maxBaud).toBe(maxBaud(layout, s, d, e, req, 100e6).maxBaud)
          }
        },
      ),
      { numRuns: 300 },
    )
  })

  it('gives bit for bit the rate sweep of the case table at the clocks it was built for', () => {
    fc.assert(
      fc.property(frameArb, rxArb, errArb, errArb, distortionArb, fc.array(fc.double({ min: 1, max: 5e6, noNaN: true }), { minLength: 1, maxLength: 8 }), (f, rx, tx, rxErr, d, bauds) => {
        const layout = frameLayout(f.dataBits, f.parity, f.stopBits, f.backToBack)
        const s = samplerModel(rx)
        const e = { tx, rx: rxErr }
        const table = caseTable(layout, s, d)
        const fixed = fixedClockCases(layout, s, e)
        for (const baud of bauds) expect(fixedClockWorstUi(fixed, table, baud)).toBe(tableWorstUi(table, e, baud))
      }),
      { numRuns: 300 },
    )
  })
})
