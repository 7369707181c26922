import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { LinkSpec, type LinkInput } from '../../../../shared/schemas/link'
import { analyzeLink } from '../../../../server/timing/analyze'
import { EngineInputError } from '../../../../server/timing/errors'
import { ENGINE_VERSION } from '../../../../server/timing/version'
import { digital, LVCMOS33, nonFinite, ns, uartLink, us } from './fixtures'

/** An invented phototransistor coupler stage (numbers are demo values, not a real part). */
const opto = (rl: number, extra: object = {}) => ({
  kind: 'phototransistor' as const,
  name: 'PTC-20 generic phototransistor coupler',
  wiring: 'collector' as const,
  ledOnWhen: 'low' as const,
  driveVoltage: 3.3,
  vf: 1.2,
  rLed: 330,
  ctrMin: 0.2,
  ctrTestCurrent: 5e-3,
  vcc: 3.3,
  rl,
  vceSat: 0.3,
  characterization: [
    { rl: 1e3, tplh: 6 * us, tphl: 3 * us, tr: 5 * us, tf: 2 * us },
    { rl: 10e3, tplh: 40 * us, tphl: 4 * us, tr: 35 * us, tf: 3 * us },
  ],
  ...extra,
})

describe('analyzeLink result', () => {
  it('carries the contract fields, the version and the parsed input', () => {
    const r = analyzeLink(uartLink([digital(30 * ns, 25 * ns, { tr: { typ: 3 * ns, max: 5 * ns }, tf: { typ: 3 * ns, max: 5 * ns } })]))
    expect(r.engineVersion).toBe(ENGINE_VERSION)
    expect(r.input.uart!.berTarget).toBe(1e-12) // schema default filled in
    const ch = r.channels[0]!
    for (const k of ['id', 'rise', 'fall', 'pwd', 'polarity', 'tr', 'tf'] as const) expect(ch).toHaveProperty(k)
    const u = r.uart!
    for (const k of ['bitTime', 'bits', 'worstMarginUi', 'maxBaud', 'clockTolerance', 'rateSweep', 'standardRates', 'berEstimate', 'byChannel'] as const)
      expect(u).toHaveProperty(k)
    for (const k of ['index', 'label', 'earlyMargin', 'lateMargin', 'margin', 'marginUi', 'worstPattern', 'limitedBy'] as const) expect(u.bits[0]).toHaveProperty(k)
    expect(u.byChannel[0]!.channelId).toBe('a2b')
    expect(r.verdict).toBe('pass')
    expect(r.assumptions.length).toBeGreaterThan(5)
    expect(r.spi).toBeNull()
  })

  it('two uart channels: one per direction, the ends swapped, the worst reported on top', () => {
    const link = uartLink([digital(30 * ns, 25 * ns)], { tx: { errorPpm: 0 }, rx: { errorPpm: 0, oversampling: 16, vote: 'majority' } }, LVCMOS33, [
      digital(300 * ns, 25 * ns),
    ])
    link.uart!.tx = { clockHz: 16e6, fractionBits: 0, oversampling: 16 }
    const r = analyzeLink(link)
    expect(r.uart!.byChannel.map((c) => c.channelId)).toEqual(['a2b', 'b2a'])
    // the first direction transmits from uart.tx's generator, the second receives with it
    expect(r.uart!.byChannel[0]!.clocks.tx.generator).not.toBeNull()
    expect(r.uart!.byChannel[1]!.clocks.rx.generator).not.toBeNull()
    expect(r.uart!.channelId).toBe('b2a')
  })

  it('a link that cannot work fails: inverted polarity, unsaturated output', () => {
    const inv = analyzeLink(uartLink([digital(30 * ns, 30 * ns, { inverting: true })]))
    expect(inv.verdict).toBe('fail')
    expect(inv.warnings.map((w) => w.code)).toContain('inverted-polarity')
    // common practice (references.md 8.2): 20 % of (3.3 - 1.2)/330 = 1.27 mA cannot pull 3.0 V across 1 kOhm (3 mA)
    const weak = analyzeLink(uartLink([opto(1e3, { ledOnWhen: 'high' })], { baud: 1200 }, LVCMOS33))
    expect(weak.warnings.map((w) => w.code)).toContain('unsaturated')
    expect(weak.verdict).toBe('fail')
  })

  it('a slow phototransistor edge at 38400 baud fails on asymmetry and passes at a low rate', () => {
    const link = uartLink([opto(4.7e3), digital(20 * ns, 20 * ns)], { baud: 38400, requiredMarginUi: 0.1 }, { ...LVCMOS33, schmitt: true, vtPlus: { min: 1.4, max: 2.0 }, vtMinus: { min: 0.8, max: 1.3 } })
    const r = analyzeLink(link)
    expect(r.channels[0]!.polarity).toBe('kept')
    expect(r.uart!.verdict).not.toBe('pass')
    expect(r.uart!.bits[r.uart!.worstBit]!.limitedBy).toBe('asymmetry')
    expect(r.uart!.maxBaud).toBeLessThan(38400)
    const slow = analyzeLink({ ...link, uart: { ...link.uart!, baud: 1200 } })
    expect(slow.uart!.verdict).toBe('pass')
  })

  it('invalid input is rejected with the failing field path', () => {
    const bad = uartLink([digital(30 * ns, 25 * ns)]) as { uart: { dataBits: number } }
    bad.uart.dataBits = 12
    expect(() => analyzeLink(bad as LinkInput)).toThrow(EngineInputError)
    try {
      analyzeLink(bad as LinkInput)
    } catch (e) {
      expect((e as EngineInputError).path).toEqual(['uart', 'dataBits'])
    }
  })
})

// ------------------------------------------------------------------ properties

const time = (max: number) => fc.double({ min: 0, max, noNaN: true })
const corners = (max: number) =>
  fc.tuple(time(max), time(max), time(max)).map((v) => v.sort((a, b) => a - b)).map(([min, typ, max]) => ({ min, typ, max }))
const trans = fc.tuple(time(1e-6), time(1e-6)).map(([a, b]) => ({ typ: Math.min(a, b), max: Math.max(a, b) }))

const digitalArb = fc.record(
  {
    kind: fc.constant('digital' as const),
    name: fc.constant('generic isolator'),
    inverting: fc.boolean(),
    tplh: corners(2e-6),
    tphl: corners(2e-6),
    pwdMax: time(1e-6),
    tr: trans,
    tf: trans,
    edge: fc.constantFrom('ramp' as const, 'exponential' as const),
    jitterRms: time(1e-8),
    jitterPeak: time(1e-8),
    partSkew: time(1e-8),
  },
  { requiredKeys: ['kind', 'name', 'tplh', 'tphl'] },
).map((d) => {
  // a real part's 50 % delay is at least 0.625 of its ramp transition (issue 18: no edge before its cause)
  const lead = 0.625 * Math.max(d.tr?.max ?? 0, d.tf?.max ?? 0)
  const shift = (c: { min: number; typ: number; max: number }) => ({ min: c.min + lead, typ: c.typ + lead, max: c.max + lead })
  return { ...d, tplh: shift(d.tplh), tphl: shift(d.tphl) }
})
const wireArb = fc.record({ kind: fc.constant('wire' as const), name: fc.constant('cable'), length: fc.double({ min: 0, max: 100, noNaN: true }) })
const rcArb = fc.record({
  kind: fc.constant('rc' as const),
  name: fc.constant('pull-up'),
  r: fc.double({ min: 10, max: 1e5, noNaN: true }),
  c: fc.double({ min: 0, max: 1e-8, noNaN: true }),
  passive: fc.constantFrom('rise' as const, 'fall' as const),
})
const optoArb = fc.record({
  rl: fc.double({ min: 100, max: 1e5, noNaN: true }),
  rLed: fc.double({ min: 50, max: 5e3, noNaN: true }),
  ctrMin: fc.double({ min: 0.05, max: 3, noNaN: true }),
  wiring: fc.constantFrom('collector' as const, 'emitter' as const),
  ledOnWhen: fc.constantFrom('high' as const, 'low' as const),
  loadCap: fc.double({ min: 0, max: 1e-9, noNaN: true }),
  points: fc.integer({ min: 1, max: 3 }),
}).map((o) => ({
  ...opto(o.rl, { rLed: o.rLed, ctrMin: o.ctrMin, wiring: o.wiring, ledOnWhen: o.ledOnWhen, loadCap: o.loadCap }),
  characterization: opto(0).characterization.slice(0, o.points),
}))
const stageArb = fc.oneof(digitalArb, digitalArb, wireArb, rcArb, optoArb)
const receiverArb = fc
  .record({ vdd: fc.double({ min: 1, max: 5.5, noNaN: true }), lo: fc.double({ min: 0.05, max: 0.45, noNaN: true }), hi: fc.double({ min: 0.55, max: 0.95, noNaN: true }), schmitt: fc.boolean(), invert: fc.boolean() })
  .map((r) => ({
    vdd: r.vdd,
    vil: r.lo * r.vdd,
    vih: r.hi * r.vdd,
    invert: r.invert,
    ...(r.schmitt ? { schmitt: true, vtPlus: { min: 0.5 * r.vdd, max: r.hi * r.vdd }, vtMinus: { min: r.lo * r.vdd, max: 0.5 * r.vdd } } : {}),
  }))
const clockArb = fc.oneof(
  fc.record({ errorPpm: fc.integer({ min: 0, max: 200000 }) }),
  fc.record({ clockHz: fc.double({ min: 1e5, max: 2e8, noNaN: true }), fractionBits: fc.integer({ min: 0, max: 4 }), tolerancePpm: fc.integer({ min: 0, max: 2000 }) }),
)
const rxArb = fc.oneof(
  clockArb.map((c) => ({ ...c, oversampling: 16, vote: 'majority' as const })),
  clockArb.map((c) => ({ ...c, oversampling: 8, sampleTicks: [3, 4, 5], vote: 'all' as const })),
  clockArb.map((c) => ({ ...c, oversampling: 16, sampleTicks: [8], vote: 'single' as const })),
  clockArb.map((c) => ({ ...c, sampler: 'ideal' as const, samplePoint: 0.5 })),
)
const uartArb = fc.record({
  baud: fc.double({ min: 1, max: 5e6, noNaN: true }),
  dataBits: fc.integer({ min: 5, max: 9 }),
  parity: fc.constantFrom('none' as const, 'even' as const, 'odd' as const, 'mark' as const, 'space' as const),
  stopBits: fc.constantFrom(1 as const, 1.5 as const, 2 as const),
  backToBack: fc.boolean(),
  requiredMarginUi: fc.double({ min: 0, max: 0.5, noNaN: true }),
  berTarget: fc.constantFrom(1e-12, 1e-9, 1e-20, 0.01),
  tx: clockArb,
  rx: rxArb,
})
const linkArb = fc
  .record({
    a: fc.array(stageArb, { maxLength: 4 }),
    b: fc.option(fc.array(stageArb, { maxLength: 3 }), { nil: undefined }),
    ra: receiverArb,
    uart: uartArb,
  })
  .map(({ a, b, ra, uart }) => uartLink(a as never, uart, ra, b as never))

/** The analysis, or null when the engine rejects the input naming a field. */
function tryAnalyze(link: Parameters<typeof analyzeLink>[0]) {
  try {
    return analyzeLink(link)
  } catch (err) {
    if (err instanceof EngineInputError) return null
    throw err
  }
}

describe('properties over links within the schema', () => {
  it('no input within the schema produces NaN or infinity', () => {
    fc.assert(
      fc.property(linkArb, (link) => {
        fc.pre(LinkSpec.safeParse(link).success)
        // timing-model.md 8: every schema-valid link of these kinds is computable with finite
        // numbers only, or rejected naming a field (issue 18: corners that put an edge before its cause)
        let r
        try {
          r = analyzeLink(link)
        } catch (err) {
          expect(err).toBeInstanceOf(EngineInputError)
          expect((err as EngineInputError).path.length).toBeGreaterThan(0)
          return
        }
        expect(nonFinite(r)).toEqual([])
      }),
      { numRuns: 300 },
    )
  })

  it('margin in UI never rises with baud', () => {
    fc.assert(
      fc.property(linkArb, (link) => {
        fc.pre(LinkSpec.safeParse(link).success)
        const r = tryAnalyze(link)
        fc.pre(r !== null)
        for (const ch of r.uart!.byChannel) {
          const s = ch.rateSweep
          for (let i = 1; i < s.length; i++) expect(s[i]!.marginUi).toBeLessThanOrEqual(s[i - 1]!.marginUi + 1e-9)
        }
        // and through the front door with stated error bounds: the same link at a higher baud
        if ('errorPpm' in link.uart!.tx && 'errorPpm' in link.uart!.rx) {
          const faster = analyzeLink({ ...link, uart: { ...link.uart!, baud: link.uart!.baud * 1.7 } })
          // no margin (a link that cannot carry data) stays without one
          if (r.uart!.worstMarginUi === null) expect(faster.uart!.worstMarginUi).toBeNull()
          else expect(faster.uart!.worstMarginUi).toBeLessThanOrEqual(r.uart!.worstMarginUi + 1e-9)
        }
      }),
      { numRuns: 100, seed: 12 },
    )
  })

  it('jitter and clock error never increase a margin', () => {
    fc.assert(
      fc.property(fc.array(digitalArb, { minLength: 1, maxLength: 3 }), fc.integer({ min: 0, max: 50000 }), time(1e-7), fc.integer({ min: 1, max: 30000 }), (stages, ppm, jit, more) => {
        const base = uartLink(stages as never, { baud: 19200, tx: { errorPpm: ppm }, rx: { errorPpm: ppm, oversampling: 16, vote: 'majority' } })
        const [first, ...rest] = stages
        const jittery = { ...first!, jitterPeak: (first!.jitterPeak ?? 0) + jit, jitterRms: (first!.jitterRms ?? 0) + jit }
        const withJitter = uartLink([jittery, ...rest] as never, base.uart)
        const withClock = uartLink(stages as never, { ...base.uart, tx: { errorPpm: ppm + more } })
        const a = analyzeLink(base).uart!
        for (const other of [analyzeLink(withJitter).uart!, analyzeLink(withClock).uart!]) {
          if (a.worstMarginUi === null) {
            expect(other.worstMarginUi).toBeNull() // a link that cannot carry data has no margin to lose
            continue
          }
          expect(other.worstMarginUi).toBeLessThanOrEqual(a.worstMarginUi + 1e-12)
          other.bits.forEach((b, i) => {
            expect(b.earlyMargin).toBeLessThanOrEqual(a.bits[i]!.earlyMargin + 1e-15)
            if (b.lateMargin !== null) expect(b.lateMargin).toBeLessThanOrEqual(a.bits[i]!.lateMargin! + 1e-15)
          })
        }
      }),
      { numRuns: 80, seed: 13 },
    )
  })

  it('symmetric delays with fast edges: zero PWD and margins independent of the delay', () => {
    fc.assert(
      fc.property(time(1e-5), time(1e-5), fc.boolean(), fc.integer({ min: 0, max: 30000 }), (d1, d2, twice, ppm) => {
        const mk = (d: number) =>
          uartLink(twice ? [digital(d, d, { inverting: true }), digital(d, d, { inverting: true })] : [digital(d, d)], {
            tx: { errorPpm: ppm },
            rx: { errorPpm: ppm, oversampling: 16, vote: 'majority' },
          })
        const a = analyzeLink(mk(d1))
        const b = analyzeLink(mk(d2))
        expect(a.channels[0]!.pwd).toEqual({ min: 0, max: 0 })
        a.uart!.bits.forEach((bit, i) => {
          expect(bit.margin).toBeCloseTo(b.uart!.bits[i]!.margin, 15)
          expect(bit.worstPattern).toBe(b.uart!.bits[i]!.worstPattern)
        })
        expect(a.uart!.maxBaud).toBe(b.uart!.maxBaud)
      }),
      { numRuns: 60 },
    )
  })
})
