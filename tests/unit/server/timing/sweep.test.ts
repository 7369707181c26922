import { describe, expect, it } from 'vitest'
import { LinkSpec, type Link, type LinkInput } from '../../../../shared/schemas/link'
import { analyzeLink } from '../../../../server/timing/analyze'
import { seriesValues } from '../../../../server/timing/eseries'
import { sweepPullup } from '../../../../server/timing/sweep'
import { PTC20 } from '../../../../shared/parts/generic'

const us = 1e-6
const mA = 1e-3

type StageIn = LinkInput['channels'][number]['stages'][number]

/** A generic 20 % phototransistor coupler, collector pull-up (invented values). */
const coupler = (over: Record<string, unknown> = {}): StageIn =>
  ({
    kind: 'phototransistor',
    name: 'generic 20 % phototransistor coupler',
    wiring: 'collector',
    ledOnWhen: 'high',
    driveVoltage: 5,
    vf: 1.5, // 3.5 V across the LED resistor: an ideal switch drives it (no drop, no pin limit)
    driver: 'transistor',
    driverDrop: 0,
    rLed: 430,
    ctrMin: 0.2,
    ctrTyp: 0.75,
    vcc: 5,
    rl: 4700,
    vceSat: 0.1,
    loadCap: 15e-12,
    ledCurrentMax: 0.05,
    collectorCurrentMax: 0.05,
    powerMax: 0.2,
    // the generic class's reference points at 5 V (shared/parts/generic.ts)
    characterization: (PTC20 as { characterization: unknown[] }).characterization,
    ...over,
  }) as StageIn

function uartLink(stage: StageIn, baud = 38400): Link {
  return LinkSpec.parse({
    schemaVersion: 1,
    name: 'isolated telemetry',
    protocol: 'uart',
    channels: [
      {
        id: 'tel',
        role: 'uart',
        stages: [stage],
        // the coupler inverts: the receiver inverts back
        receiver: { vdd: 5, vih: 3.5, vil: 1.5, invert: true },
      },
    ],
    uart: {
      baud,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      requiredMarginUi: 0.1,
      tx: { errorPpm: 5000 },
      rx: { errorPpm: 5000, oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
    },
  } satisfies LinkInput)
}

describe('pull-up sweep arithmetic (common practice)', () => {
  const r = sweepPullup(uartLink(coupler()), 'tel', 0, { series: 'E24', rlMin: 1000, rlMax: 10000, overdrive: 1, targetBaud: 9600 })
  const row = r.rows.find((x) => x.rl === 1200)!

  it('5 V less VCE(sat) across 1.2 kOhm is about 4.1 mA', () => {
    // common practice (issue 3)
    expect(row.ic / mA).toBeCloseTo(4.1, 1)
  })
  it('at 20 % CTR that needs about 20 mA of LED current', () => {
    // common practice (issue 3): 4.08 mA / 0.2 = 20.4 mA
    expect(row.ledCurrentRequired / mA).toBeCloseTo(20.4, 1)
    expect(Math.abs(row.ledCurrentRequired / mA - 20)).toBeLessThan(0.5)
  })
  it('3.5 V across the LED resistor: the E24 value that still gives it is 160 ohm', () => {
    // common practice (issue 3): 3.5 V / 20 mA = 175 ohm -> E24 160 ohm (180 would give only 19.4 mA)
    expect(row.rLed).toBe(160)
    expect(row.ledCurrent! / mA).toBeCloseTo(3.5 / 160 / mA, 9)
    expect(row.ledCurrent!).toBeGreaterThanOrEqual(row.ledCurrentRequired)
    expect(row.overdrive).toBeGreaterThanOrEqual(1)
  })
  it('every row: the LED resistor is the largest standard value still delivering the required current', () => {
    const e24 = seriesValues('E24', 1, 1e6)
    for (const x of r.rows) {
      expect(x.ledCurrent!).toBeGreaterThanOrEqual(x.ledCurrentRequired * (1 - 1e-12))
      const next = e24[e24.indexOf(x.rLed!) + 1]!
      expect(3.5 / next).toBeLessThan(x.ledCurrentRequired)
    }
    expect(r.rows.map((x) => x.rl)).toEqual(seriesValues('E24', 1000, 10000))
  })
  it('overdrive scales the LED current needed', () => {
    const r2 = sweepPullup(uartLink(coupler()), 'tel', 0, { series: 'E24', rlMin: 1200, rlMax: 1200, overdrive: 2, targetBaud: 9600 })
    expect(r2.rows[0]!.ledCurrentRequired).toBeCloseTo(2 * row.ledCurrentRequired, 15)
  })
  it('derating is applied: CTR 20 % x 0.8 x 0.5 needs 2.5 times the current', () => {
    const s = coupler({ ctrDerating: { temperature: 0.8, endOfLife: 0.5 } })
    const r3 = sweepPullup(uartLink(s), 'tel', 0, { series: 'E24', rlMin: 1200, rlMax: 1200, overdrive: 1, targetBaud: 9600 })
    expect(r3.rows[0]!.ledCurrentRequired).toBeCloseTo(2.5 * row.ledCurrentRequired, 15)
  })
})

describe('pull-up sweep against the link analysis', () => {
  const link = uartLink(coupler())

  it('the 4.7 kOhm pull-up misses 7200 baud; a smaller one meets it and is recommended', () => {
    // the class's storage delay (about 20 us) keeps this coupler below 10 kBd whatever the pull-up
    const r = sweepPullup(link, 'tel', 0, { series: 'E12', rlMin: 470, rlMax: 10000, overdrive: 1.2, targetBaud: 7200 })
    expect(r.targetBaud).toBe(7200)
    const at47 = r.rows.find((x) => x.rl === 4700)!
    expect(at47.meetsTarget).toBe(false)
    expect(at47.feasible).toBe(false)
    expect(at47.reasons.join(' ')).toMatch(/below the required/)
    expect(r.recommended).not.toBeNull()
    const rec = r.rows[r.recommended!]!
    expect(rec.feasible).toBe(true)
    expect(rec.rl).toBeLessThan(4700)
    // least LED current among the feasible rows
    for (const x of r.rows.filter((y) => y.feasible)) expect(x.ledCurrent!).toBeGreaterThanOrEqual(rec.ledCurrent! * (1 - 1e-12))
    // the faster alternatives are feasible and faster
    for (const i of r.alternatives) {
      expect(r.rows[i]!.feasible).toBe(true)
      expect(r.rows[i]!.maxBaud!).toBeGreaterThan(rec.maxBaud!)
      expect(r.rows[i]!.fasterAlternative).toBe(true)
    }
    expect(r.rows.filter((x) => x.fasterAlternative).length).toBe(r.alternatives.length)
  })

  it('each row equals a direct analysis of the link with that pull-up and LED resistor', () => {
    const r = sweepPullup(link, 'tel', 0, { series: 'E12', rlMin: 1000, rlMax: 3300, overdrive: 1.2 })
    for (const x of r.rows) {
      const changed = uartLink(coupler({ rl: x.rl, rLed: x.rLed }))
      const a = analyzeLink(changed)
      expect(x.marginUi).toBeCloseTo(a.uart!.worstMarginUi, 12)
      expect(x.maxBaud).toBe(a.uart!.maxBaud)
      expect(x.tplh).toBeCloseTo(a.channels[0]!.stages[0]!.tplh.typ, 15)
    }
    // margin falls as the pull-up grows (slower passive edge)
    const m = r.rows.map((x) => x.marginUi!)
    for (let i = 1; i < m.length; i++) expect(m[i]!).toBeLessThanOrEqual(m[i - 1]! + 1e-12)
  })

  it('the target defaults to the link baud; at 38400 no pull-up makes this coupler pass, and the sweep says what would', () => {
    // timing-model.md 5: the slow edge is storage-dominated (about 20 us in this class): no pull-up or LED
    // current brings it under a 26 us bit with 0.1 UI to spare; the advice evaluates the circuit changes
    const r = sweepPullup(link, 'tel', 0, { series: 'E12', rlMin: 470, rlMax: 10000, overdrive: 1.2 })
    expect(r.targetBaud).toBe(38400)
    expect(r.rows.filter((x) => x.meetsTarget)).toEqual([])
    expect(r.recommended).toBeNull()
    const advice = r.advice!
    expect(advice.reachedBaud).toBeGreaterThan(5000)
    expect(advice.reachedBaud).toBeLessThan(38400)
    expect(r.rows[advice.bestRow!]!.withinRatings).toBe(true)
    const byChange = Object.fromEntries(advice.options.map((o) => [o.change, o]))
    expect(byChange['logic-output-coupler']!.meetsTarget).toBe(true)
    expect(byChange['lower-rate']!.maxBaud).toBe(advice.reachedBaud)
    expect(byChange['schmitt-buffer']).toBeDefined()
  })

  it('a stage with a base-emitter resistor sweeps RBE over E12 as well, with an open-base row per pull-up', () => {
    const r = sweepPullup(uartLink(coupler({ rbe: 470e3, hfe: 500 })), 'tel', 0, { series: 'E12', rlMin: 1000, rlMax: 2200, overdrive: 1.2, targetBaud: 4800 })
    expect(r.rbeValues).toEqual(seriesValues('E12', 47e3, 1e6))
    expect(r.rows.length).toBe(seriesValues('E12', 1000, 2200).length * (r.rbeValues.length + 1))
    const open = r.rows.find((x) => x.rl === 1000 && x.rbe === null)!
    const withRbe = r.rows.find((x) => x.rl === 1000 && x.rbe === 100e3)!
    // RBE diverts hFE x VBE / RBE: the LED current needed rises by that over the derated CTR
    expect(withRbe.ledCurrentRequired - open.ledCurrentRequired).toBeCloseTo((500 * 0.7) / 100e3 / 0.2, 12)
    // and the rise, pulled down actively, is faster
    expect(withRbe.tr).toBeLessThan(open.tr)
  })

  it('a two-direction link: sweeping the second direction matches the full analysis row by row', () => {
    // the second uart channel runs the other way (its clocks swap): the sweep must keep that
    const two = LinkSpec.parse({
      ...link,
      channels: [
        { ...link.channels[0]!, id: 'fwd', stages: [coupler({ rl: 1000, rLed: 100, partSkew: 1 * us })] },
        { ...link.channels[0]!, id: 'back' },
      ],
      uart: { ...link.uart!, tx: { clockHz: 16e6, oversampling: 16, fractionBits: 4, tolerancePpm: 2000 }, rx: { errorPpm: 3000, oversampling: 8, vote: 'majority' } },
    })
    const r = sweepPullup(two, 'back', 0, { series: 'E24', rlMin: 470, rlMax: 4700, overdrive: 1.3, targetBaud: 19200 })
    for (const x of r.rows) {
      const changed = structuredClone(two)
      changed.uart!.baud = 19200
      changed.channels[1]!.stages[0] = { ...(changed.channels[1]!.stages[0] as object), rl: x.rl, rLed: x.rLed!, ledCurrent: undefined } as never
      const a = analyzeLink(changed)
      expect(x.marginUi).toBeCloseTo(a.uart!.worstMarginUi, 12)
      expect(x.verdict).toBe(a.verdict)
      const maxes = a.uart!.byChannel.map((c) => c.maxBaud)
      expect(x.maxBaud).toBeCloseTo(Math.min(...(maxes as number[])), 6)
    }
    expect(() => sweepPullup(two, 'fwd', 0, { series: 'E12', rlMin: 1000, rlMax: 2000 })).not.toThrow()
  })

  it('a driving-pin limit makes the small pull-ups infeasible, with the reason', () => {
    const r = sweepPullup(uartLink(coupler({ driverCurrentMax: 10 * mA })), 'tel', 0, { series: 'E12', rlMin: 1000, rlMax: 10000, overdrive: 1 })
    const small = r.rows.find((x) => x.rl === 1000)! // needs 24.5 mA
    expect(small.withinRatings).toBe(false)
    expect(small.feasible).toBe(false)
    expect(small.reasons.join(' ')).toMatch(/Driving pin current/)
    const big = r.rows.find((x) => x.rl === 10000)! // needs 2.45 mA
    expect(big.withinRatings).toBe(true)
  })

  it('a drive that cannot light the LED gives infeasible rows without margins', () => {
    const r = sweepPullup(uartLink(coupler({ driveVoltage: 1.2, vf: 1.5 })), 'tel', 0, { series: 'E12', rlMin: 1000, rlMax: 2200 })
    for (const x of r.rows) {
      expect(x.rLed).toBeNull()
      expect(x.marginUi).toBeNull()
      expect(x.feasible).toBe(false)
      expect(x.reasons[0]).toMatch(/forward voltage/)
    }
    expect(r.recommended).toBeNull()
  })

  it('an E96 sweep over three decades has 288 rows and no NaN or infinity', () => {
    const r = sweepPullup(link, 'tel', 0, { series: 'E96', rlMin: 100, rlMax: 97600, overdrive: 1.5 })
    expect(r.rows.length).toBe(288)
    const bad = JSON.stringify(r, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? 'BAD' : v))
    expect(bad).not.toContain('BAD')
  })

  it('rejects a bad channel, stage or range with the field named', () => {
    expect(() => sweepPullup(link, 'nope', 0, { series: 'E12', rlMin: 1000, rlMax: 2000 })).toThrow(/no channel/)
    expect(() => sweepPullup(link, 'tel', 3, { series: 'E12', rlMin: 1000, rlMax: 2000 })).toThrow(/not a phototransistor/)
    expect(() => sweepPullup(link, 'tel', 0, { series: 'E12', rlMin: 2000, rlMax: 1000 })).toThrow(/rlMin/)
    expect(() => sweepPullup(link, 'tel', 0, { series: 'E12', rlMin: 1000, rlMax: 2000, overdrive: 0 })).toThrow(/overdrive/)
  })
})

describe('pull-up sweep on an RS-485 link', () => {
  const fixed = (d: number) => ({ min: d, typ: d, max: d })
  /** Half duplex: the data through the coupler and a transceiver, DE through a fast isolator to the same transceiver (invented values). */
  const rs485Link = (lagTime: number): Link =>
    LinkSpec.parse({
      schemaVersion: 2,
      name: 'isolated field bus',
      protocol: 'rs485',
      channels: [
        {
          id: 'data',
          role: 'uart',
          stages: [coupler(), { kind: 'transceiver', name: 'transceiver', driverDelay: fixed(40e-9), receiverDelay: fixed(60e-9) }],
          receiver: { vdd: 5, vih: 3.5, vil: 1.5, invert: true },
        },
        {
          id: 'de',
          role: 'de',
          stages: [
            { kind: 'digital', name: 'isolator', tplh: fixed(100e-9), tphl: fixed(100e-9) },
            { kind: 'transceiver', name: 'transceiver', driverDelay: fixed(40e-9), receiverDelay: fixed(60e-9), enableTime: 200e-9, disableTime: 100e-9 },
          ],
          receiver: { vdd: 5, vih: 3.5, vil: 1.5 },
        },
      ],
      uart: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, requiredMarginUi: 0.1, tx: { errorPpm: 5000 }, rx: { errorPpm: 5000, oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' } },
      rs485: { duplex: 'half', leadTime: 1e-6, lagTime },
    } satisfies LinkInput)

  it('each row re-checks the turnaround through the swept coupler, as the full analysis of that row does', () => {
    // a DE lag of 30 µs: the large pull-ups make the coupler's slowest edge on the data path longer than that
    const link = rs485Link(30e-6)
    const r = sweepPullup(link, 'data', 0, { series: 'E12', rlMin: 470, rlMax: 22000, overdrive: 1, targetBaud: 9600 })
    const turnaroundFails = r.rows.map((x) => x.reasons.some((s) => /RS-485 turnaround fails/.test(s)))
    // both kinds of row occur, so the check below compares something
    expect(turnaroundFails).toContain(true)
    expect(turnaroundFails).toContain(false)
    r.rows.forEach((row, i) => {
      if (row.rLed === null) return
      const applied = structuredClone(link)
      applied.channels[0]!.stages[0] = { ...(applied.channels[0]!.stages[0] as object), rl: row.rl, rLed: row.rLed, ledCurrent: undefined } as Link['channels'][number]['stages'][number]
      const full = analyzeLink(applied)
      expect(full.rs485!.pass).toBe(!turnaroundFails[i])
      if (turnaroundFails[i]) {
        expect(row.feasible).toBe(false)
        expect(row.verdict).toBe('fail')
      }
    })
    // a row that meets the margin and the turnaround is recommended
    expect(r.recommended).not.toBeNull()
    expect(turnaroundFails[r.recommended!]).toBe(false)
  })

  it('a link other than UART or RS-485 is refused, naming the protocol', () => {
    const i2c = { ...rs485Link(10e-6), protocol: 'spi' } as unknown as Link
    expect(() => sweepPullup(i2c, 'data', 0, { series: 'E12', rlMin: 1000, rlMax: 2000 })).toThrow(/UART or RS-485/)
  })
})
