/**
 * The I2C, CAN and RS-485 link types end to end through analyzeLink (issue 15): the result
 * contract, published worked examples, properties that physics demands, and bad input that must
 * name its field.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyzeLink, EngineInputError, i2cFallTime, i2cRiseTime, parseLink } from '../../../../server/timing'
import { FIELD_RS485_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK } from '../../../../server/db/seeders/demo-links'
import type { LinkInput } from '../../../../shared/schemas/link'

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T

/** A fixed-delay transceiver stage (min = typ = max). */
const transceiver = (driver: number, receiver: number) => ({
  kind: 'transceiver' as const,
  name: 'transceiver',
  driverDelay: { min: driver, typ: driver, max: driver },
  receiverDelay: { min: receiver, typ: receiver, max: receiver },
})

/** A fixed-delay isolator channel. */
const isolator = (d: number) => ({ kind: 'digital' as const, name: 'isolator', tplh: { min: d, typ: d, max: d }, tphl: { min: d, typ: d, max: d } })

const receiver = { vdd: 3.3, vih: 2, vil: 0.8 }

describe('I2C link', () => {
  const a = analyzeLink(MONITOR_I2C_LINK)
  const i2c = a.i2c!

  it('returns the contract: checks with id, slack in seconds and pass, and the highest SCL', () => {
    expect(a.uart).toBeNull()
    expect(i2c.checks.length).toBeGreaterThanOrEqual(8)
    for (const c of i2c.checks) {
      expect(typeof c.id).toBe('string')
      expect(Number.isFinite(c.slack)).toBe(true)
      expect(typeof c.pass).toBe('boolean')
    }
    expect(i2c.maxSclHz).toBeGreaterThan(0)
    expect(a.verdict).toBe('pass')
  })

  it('uses the rise time 0.8473 Rp Cb on each side and the Fast-mode limits', () => {
    const t = MONITOR_I2C_LINK.i2c!.target
    const rise = i2c.checks.find((c) => c.id === 'rise-target')!
    // NXP UM10204 section 7.1: tr(30 %-70 %) = 0.8473 Rp Cb
    expect(rise.value).toBeCloseTo(0.8473 * t.rp * t.cb, 12)
    expect(rise.value).toBeCloseTo(i2cRiseTime(t.rp, t.cb), 15)
    // NXP UM10204 Table 10, Fast mode: tr 300 ns, tLOW 1.3 us, tHIGH 0.6 us, tSU;DAT 100 ns, fSCL 400 kHz
    expect(rise.limit).toBeCloseTo(300e-9, 15)
    expect(i2c.checks.find((c) => c.id === 'low-controller')!.limit).toBeCloseTo(1.3e-6, 15)
    expect(i2c.checks.find((c) => c.id === 'high-target')!.limit).toBeCloseTo(0.6e-6, 15)
    expect(i2c.checks.find((c) => c.id === 'mode-frequency')!.limit).toBeCloseTo(1 / 400e3, 15)
    // NXP UM10204 Table 10, Fast mode: tf 300 ns max; the driver sinks at least IOL = 3 mA
    const fall = i2c.checks.find((c) => c.id === 'fall-target')!
    expect(fall.limit).toBeCloseTo(300e-9, 15)
    // common practice: a constant-current sink against the pull-up, Rp Cb ln((IOL - 0.3 VDD/Rp) / (IOL - 0.7 VDD/Rp)) (ngspice grid: i2c-spice.test.ts)
    expect(fall.value).toBeCloseTo(t.rp * t.cb * Math.log((3e-3 - (0.3 * t.vdd) / t.rp) / (3e-3 - (0.7 * t.vdd) / t.rp)), 15)
    // NXP UM10204 section 7.1 worked example: Rp(min) = (3.3 V - 0.4 V) / 3 mA = 967 ohm
    expect(i2c.levelChecks.find((c) => c.id === 'rp-min-controller')!.limit).toBeCloseTo(966.7, 1)
  })

  it('at the highest SCL the check that sets it has exactly the required slack', () => {
    const at = clone(MONITOR_I2C_LINK)
    at.i2c!.sclHz = i2c.maxSclHz!
    const r = analyzeLink(at).i2c!
    const c = r.checks.find((x) => x.id === i2c.maxSclLimitedBy)!
    const need = ['mode-frequency', 'rise-controller', 'rise-target', 'fall-controller', 'fall-target'].includes(c.id) ? 0 : (MONITOR_I2C_LINK.i2c!.requiredSlack ?? 0)
    expect(c.slack).toBeCloseTo(need, 12)
    expect(r.pass).toBe(true)
    at.i2c!.sclHz = i2c.maxSclHz! * 1.01
    expect(analyzeLink(at).i2c!.pass).toBe(false)
  })

  it('names the limiting check in a failing verdict (400 kHz is out of reach through this isolator)', () => {
    const fast = clone(MONITOR_I2C_LINK)
    fast.i2c!.sclHz = 400e3
    const r = analyzeLink(fast)
    expect(r.verdict).toBe('fail')
    expect(r.i2c!.limiting).toBe('high-target')
  })

  it('checks the isolator offset against VIL on its side', () => {
    const off = clone(MONITOR_I2C_LINK)
    off.i2c!.isolator = { lowOffset: 1.1, offsetSide: 'controller' }
    // NXP UM10204 Table 10: VIL = 0.3 VDD = 0.99 V at 3.3 V
    const c = analyzeLink(off).i2c!.levelChecks.find((x) => x.id === 'offset-vil-controller')!
    expect(c.limit).toBeCloseTo(0.99, 12)
    expect(c.pass).toBe(false)
  })

  it('refuses a pull-up below Rp(min) with an error naming the field', () => {
    const low = clone(MONITOR_I2C_LINK)
    low.i2c!.target.rp = 680
    expect(() => analyzeLink(low)).toThrow(EngineInputError)
    try {
      analyzeLink(low)
    } catch (e) {
      expect((e as EngineInputError).path).toEqual(['i2c', 'target', 'rp'])
      expect((e as Error).message).toMatch(/^i2c\.target\.rp: .*Rp\(min\)/)
    }
  })

  it('sweeps each side over E24 with the current pull-up marked', () => {
    for (const side of i2c.pullupSweep) {
      expect(side.rows.length).toBeGreaterThan(5)
      expect(side.rows.some((r) => r.current)).toBe(true)
      for (const r of side.rows) if (!r.rpOk) expect(r.maxSclHz).toBeNull()
    }
  })

  it('each sweep row carries its fall against the mode\'s tf, and a small pull-up on a heavy bus fails it', () => {
    // NXP UM10204 Table 10, Fast mode: tf 300 ns max at IOL 3 mA; VOL 0.4 V gives Rp(min) 1.53 kOhm at 5 V
    const heavy = clone(MONITOR_I2C_LINK)
    heavy.i2c!.target = { ...heavy.i2c!.target, vdd: 5, cb: 400e-12, rp: 2200 }
    const rows = analyzeLink(heavy).i2c!.pullupSweep.find((x) => x.side === 'target')!.rows
    for (const r of rows) {
      expect(r.fall).toBe(Number.isFinite(i2cFallTime({ vdd: 5, rp: r.rp, cb: 400e-12 }, 3e-3)) ? i2cFallTime({ vdd: 5, rp: r.rp, cb: 400e-12 }, 3e-3) : null)
      expect(r.fallOk).toBe(r.fall !== null && r.fall <= 300e-9)
    }
    // 1.6 kOhm is above Rp(min) yet its fall exceeds 300 ns on 400 pF: the row says so
    const r16 = rows.find((r) => r.rp === 1600)!
    expect(r16.rpOk).toBe(true)
    expect(r16.fallOk).toBe(false)
  })

  it('property: more bus capacitance never shortens the rise nor raises the highest SCL', () => {
    fc.assert(
      fc.property(fc.double({ min: 10e-12, max: 350e-12, noNaN: true }), fc.double({ min: 1.01, max: 3, noNaN: true }), (cb, k) => {
        const l1 = clone(MONITOR_I2C_LINK)
        l1.i2c!.target.cb = cb
        const l2 = clone(l1)
        l2.i2c!.target.cb = Math.min(cb * k, 400e-12)
        const r1 = analyzeLink(l1).i2c!
        const r2 = analyzeLink(l2).i2c!
        const rise = (r: typeof r1) => r.checks.find((c) => c.id === 'rise-target')!.value
        const fall = (r: typeof r1) => r.checks.find((c) => c.id === 'fall-target')!.value
        expect(rise(r2)).toBeGreaterThanOrEqual(rise(r1))
        expect(fall(r2)).toBeGreaterThanOrEqual(fall(r1))
        expect(r2.maxSclHz ?? 0).toBeLessThanOrEqual((r1.maxSclHz ?? 0) * (1 + 1e-12))
      }),
      { numRuns: 60 },
    )
  })

  it('property: more isolator delay never increases any slack', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 200e-9, noNaN: true }), (extra) => {
        const base = clone(MONITOR_I2C_LINK)
        const slow = clone(MONITOR_I2C_LINK)
        for (const ch of slow.channels) ch.stages.push(isolator(extra))
        const r1 = analyzeLink(base).i2c!
        const r2 = analyzeLink(slow).i2c!
        for (const c of r1.checks) {
          if (c.id === 'hold-target') continue // the same extra delay on SCL and SDA leaves the hold unchanged, checked below
          expect(r2.checks.find((x) => x.id === c.id)!.slack).toBeLessThanOrEqual(c.slack + 1e-15)
        }
        expect(r2.checks.find((x) => x.id === 'hold-target')!.slack).toBeCloseTo(r1.checks.find((x) => x.id === 'hold-target')!.slack, 15)
      }),
      { numRuns: 40 },
    )
  })
})

/** A CAN node whose txd and rxd paths have the given delays (fixed corners). */
function canLink(opts: { driver: number; receiver: number; isolator?: number; busLength: number; clockHz: number; bitRate: number; timing?: NonNullable<LinkInput['can']>['timing'] }): LinkInput {
  const iso = opts.isolator ?? 0
  const txd = iso > 0 ? [isolator(iso), transceiver(opts.driver, opts.receiver)] : [transceiver(opts.driver, opts.receiver)]
  const rxd = iso > 0 ? [transceiver(opts.driver, opts.receiver), isolator(iso)] : [transceiver(opts.driver, opts.receiver)]
  return {
    schemaVersion: 2,
    name: 'CAN test',
    protocol: 'can',
    channels: [
      { id: 'txd', role: 'txd', stages: txd, receiver },
      { id: 'rxd', role: 'rxd', stages: rxd, receiver },
    ],
    can: { bitRate: opts.bitRate, clockHz: opts.clockHz, busLength: opts.busLength, ...(opts.timing ? { timing: opts.timing } : {}) },
  }
}

describe('CAN link', () => {
  it('returns the contract: bitTimings with brp, tq, segments, sample point, tolerance, loopDelayFits, and maxBusLength', () => {
    const a = analyzeLink(PUMP_CAN_LINK)
    const can = a.can!
    expect(can.bitTimings.length).toBeGreaterThan(0)
    for (const r of can.bitTimings) {
      for (const k of ['brp', 'tq', 'propSeg', 'phaseSeg1', 'phaseSeg2', 'sjw', 'samplePoint', 'tolerance'] as const) expect(Number.isFinite(r[k])).toBe(true)
      expect(typeof r.loopDelayFits).toBe('boolean')
      // ISO 11898-1: bit time = Sync_Seg (1 tq) + Prop_Seg + Phase_Seg1 + Phase_Seg2
      expect(r.brp * (1 + r.propSeg + r.phaseSeg1 + r.phaseSeg2)).toBe(PUMP_CAN_LINK.can!.clockHz / PUMP_CAN_LINK.can!.bitRate)
    }
    expect(can.maxBusLength).toBeGreaterThan(PUMP_CAN_LINK.can!.busLength)
    expect(a.verdict).toBe('pass')
  })

  it('the TI DCAN / Bosch worked example: 1 Mbit/s, tq 100 ns, 640 ns of round trip -> Prop_Seg 7 tq fits, tolerance 0.39 %', () => {
    // TI DCAN TRM section 23.3.16.2.2 (after the Bosch C_CAN user manual): 10 MHz CAN clock, BRP 1, 10 tq per bit;
    // driver 60 ns + receiver 40 ns, bus 220 ns one way (44 m at 5 ns/m): 2 x 320 ns = 640 ns -> Prop_Seg 7 tq,
    // Phase_Seg1 = Phase_Seg2 = 1 tq, SJW 1: tolerance min(1 / (2 (13 x 10 - 1)), 1 / (20 x 10)) = 0.39 %
    const link = canLink({ driver: 60e-9, receiver: 40e-9, busLength: 44, clockHz: 10e6, bitRate: 1e6, timing: { brp: 1, propSeg: 7, phaseSeg1: 1, phaseSeg2: 1, sjw: 1 } })
    const can = analyzeLink(link).can!
    expect(can.propagation).toBeCloseTo(640e-9, 15)
    expect(can.chosenFrom).toBe('settings')
    expect(can.chosen!.loopDelayFits).toBe(true)
    expect(can.chosen!.tolerance).toBeCloseTo(1 / 258, 12)
    expect(can.chosen!.tolerance).toBeCloseTo(0.0039, 4)
    // 7 tq cover 700 ns of round trip: 50 m still fit, 51 m (710 ns) do not
    expect(analyzeLink({ ...link, can: { ...link.can!, busLength: 50 } }).can!.chosen!.loopDelayFits).toBe(true)
    const longer = analyzeLink({ ...link, can: { ...link.can!, busLength: 51 } }).can!
    expect(longer.chosen!.loopDelayFits).toBe(false)
    expect(longer.checks.find((c) => c.id === 'loop-delay')!.pass).toBe(false)
  })

  it('an impossible bit timing, and a sample point outside the bit, are refused naming the field', () => {
    // 10 MHz cannot be divided into 333 kbit/s with 8 to 25 tq per bit
    expect(() => analyzeLink(canLink({ driver: 60e-9, receiver: 40e-9, busLength: 10, clockHz: 10e6, bitRate: 333e3 }))).toThrow(/^can\.clockHz: /)
    const wrong = canLink({ driver: 60e-9, receiver: 40e-9, busLength: 10, clockHz: 10e6, bitRate: 1e6, timing: { brp: 2, propSeg: 7, phaseSeg1: 1, phaseSeg2: 1, sjw: 1 } })
    expect(() => parseLink(wrong)).toThrow(/^can\.timing\.brp: /)
    const sp = canLink({ driver: 60e-9, receiver: 40e-9, busLength: 10, clockHz: 10e6, bitRate: 1e6 })
    sp.can!.samplePoint = 1.2
    expect(() => parseLink(sp)).toThrow(/^can\.samplePoint: .*inside the bit/)
    const sjw = canLink({ driver: 60e-9, receiver: 40e-9, busLength: 10, clockHz: 10e6, bitRate: 1e6, timing: { brp: 1, propSeg: 5, phaseSeg1: 2, phaseSeg2: 2, sjw: 3 } })
    expect(() => parseLink(sjw)).toThrow(/^can\.timing\.sjw: /)
  })

  it('property: a longer bus never increases the bit rate it allows, more isolator delay never shortens it less', () => {
    const rates = [1e6, 500e3, 250e3, 125e3]
    fc.assert(
      fc.property(fc.double({ min: 20e-9, max: 200e-9, noNaN: true }), fc.double({ min: 0, max: 100e-9, noNaN: true }), fc.double({ min: 0, max: 80e-9, noNaN: true }), (drv, iso, extra) => {
        const a = analyzeLink(canLink({ driver: drv, receiver: drv, isolator: iso, busLength: 1, clockHz: 40e6, bitRate: 500e3 })).can!
        // longest bus per rate: non-decreasing as the rate falls (a longer bus needs a slower rate)
        const lengths = rates.map((r) => a.lengthByRate.find((x) => x.bitRate === r)!.maxBusLength ?? -1)
        for (let k = 1; k < lengths.length; k++) expect(lengths[k]!).toBeGreaterThanOrEqual(lengths[k - 1]!)
        const b = analyzeLink(canLink({ driver: drv, receiver: drv, isolator: iso + extra, busLength: 1, clockHz: 40e6, bitRate: 500e3 })).can!
        expect(b.maxBusLength ?? -1).toBeLessThanOrEqual((a.maxBusLength ?? -1) + 1e-9)
        expect(b.checks.find((c) => c.id === 'loop-delay')!.slack).toBeLessThanOrEqual(a.checks.find((c) => c.id === 'loop-delay')!.slack + 1e-15)
      }),
      { numRuns: 50 },
    )
  })

  it('CAN FD: the data phase shortens bits by the loop asymmetry and checks the loop delay without compensation', () => {
    const l = clone(PUMP_CAN_LINK)
    l.can!.fd = { dataBitRate: 2e6, dataSamplePoint: 0.75, tdc: false }
    const can = analyzeLink(l).can!
    // 2 Mbit/s: 500 ns data bit, sample point at 375 ns; the loop delay (about 290 ns) fits without compensation
    expect(can.fd!.dataBitTime).toBeCloseTo(500e-9, 15)
    const loop = can.checks.find((c) => c.id === 'fd-loop-delay')!
    expect(loop.limit).toBeCloseTo(375e-9, 15)
    expect(loop.value).toBeCloseTo(can.node.loopDelay, 15)
    l.can!.fd.dataBitRate = 5e6
    const five = analyzeLink(l)
    expect(five.can!.checks.find((c) => c.id === 'fd-loop-delay')!.pass).toBe(false)
    expect(five.verdict).toBe('fail')
  })
})

describe('RS-485 link', () => {
  it('the demo fails its turnaround at the start bit; a DE lead of the stated minimum fixes it', () => {
    const a = analyzeLink(FIELD_RS485_LINK)
    expect(a.uart).not.toBeNull()
    expect(a.rs485!.checks.find((c) => c.id === 'de-lead')!.pass).toBe(false)
    expect(a.rs485!.limiting).toBe('de-lead')
    expect(a.verdict).toBe('fail')
    const fixed = clone(FIELD_RS485_LINK)
    fixed.rs485!.leadTime = 5e-6
    const b = analyzeLink(fixed)
    expect(b.rs485!.pass).toBe(true)
    expect(b.verdict).toBe(b.uart!.verdict)
    // at exactly the shortest lead the slack is zero
    const edge = clone(FIELD_RS485_LINK)
    edge.rs485!.leadTime = a.rs485!.minLeadTime!
    expect(analyzeLink(edge).rs485!.checks[0]!.slack).toBeCloseTo(0, 15)
  })

  it('the data path to the bus stops at the first transceiver\'s driver', () => {
    const r = analyzeLink(FIELD_RS485_LINK).rs485!
    // DIS-1 (50..150 ns) + RTX-10 driver (20..70 ns): demo data
    expect(r.dataPath.min).toBeCloseTo(70e-9, 15)
    expect(r.dataPath.max).toBeCloseTo(220e-9, 15)
  })

  it('property: more delay on the enable path never increases the lead slack', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e-6, noNaN: true }), (extra) => {
        const slow = clone(FIELD_RS485_LINK)
        slow.channels[1]!.stages.unshift(isolator(extra))
        const a = analyzeLink(FIELD_RS485_LINK).rs485!
        const b = analyzeLink(slow).rs485!
        expect(b.checks[0]!.slack).toBeLessThanOrEqual(a.checks[0]!.slack + 1e-15)
      }),
      { numRuns: 30 },
    )
  })

  it('a half-duplex link needs a de channel whose transceiver states its enable times', () => {
    const noDe = clone(FIELD_RS485_LINK)
    noDe.channels.pop()
    expect(() => parseLink(noDe)).toThrow(/'de' channel/)
    const noTimes = clone(FIELD_RS485_LINK)
    const t = noTimes.channels[1]!.stages[1] as { enableTime?: number }
    delete t.enableTime
    expect(() => parseLink(noTimes)).toThrow(/^channels\.1\.stages\.1\.enableTime: /)
  })
})

describe('link document version', () => {
  it('reads a version 1 document as it is', () => {
    const v1 = { ...clone(PUMP_CAN_LINK), schemaVersion: 1 }
    expect(parseLink(v1).schemaVersion).toBe(1)
    expect(() => parseLink({ ...v1, schemaVersion: 3 })).toThrow(/schemaVersion must be 2/)
  })
})
