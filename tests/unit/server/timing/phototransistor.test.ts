import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { PhototransistorStage } from '../../../../shared/schemas/link'
import { phototransistorModel, TYPICAL_SPREAD } from '../../../../server/timing/phototransistor'
import { CTR_TYP_MULTIPLE, DEFAULT_HFE, VBE_HIGH } from '../../../../shared/utils/coupler'

const us = 1e-6
const pF = 1e-12
const mA = 1e-3

/** A generic 20 % phototransistor coupler (invented values) parsed through the schema. */
function stage(over: Record<string, unknown> = {}): PhototransistorStage {
  return PhototransistorStage.parse({
    kind: 'phototransistor',
    name: 'generic 20 % phototransistor coupler',
    driveVoltage: 5,
    vf: 1.2,
    rLed: 160,
    driverDrop: 0,
    ctrMin: 0.2,
    vcc: 5,
    rl: 1200,
    vceSat: 0.1,
    characterization: [
      // invented points with the class's physics: storage-dominated tPLH, tr proportional to RL
      { rl: 1000, ledCurrent: 20 * mA, loadCap: 0, tplh: 15 * us, tphl: 1.8 * us, tr: 3.2 * us, tf: 2 * us },
      { rl: 10000, ledCurrent: 20 * mA, loadCap: 0, tplh: 41 * us, tphl: 1.5 * us, tr: 26 * us, tf: 1.4 * us },
    ],
    ...over,
  })
}
const codes = (w: { code: string }[]) => w.map((x) => x.code)

describe('phototransistor operating point', () => {
  it('5 V less VCE(sat) across 1.2 kOhm is about 4.1 mA, and 20 % CTR needs about 20 mA', () => {
    // common practice (issue 3): (5 - 0.1) / 1200 = 4.08 mA; 4.08 mA / 0.2 = 20.4 mA
    const { operating } = phototransistorModel(stage({ rLed: undefined, ledCurrent: 20.5 * mA }))
    expect(operating.icRequired / mA).toBeCloseTo(4.1, 1)
    expect(operating.icRequired / 0.2 / mA).toBeCloseTo(20.4, 1)
    expect(operating.saturated).toBe(true)
    expect(operating.overdrive).toBeCloseTo(1, 2)
    expect(phototransistorModel(stage({ rLed: undefined, ledCurrent: 20 * mA })).operating.saturated).toBe(false)
  })

  it('CTR = IC / IF: 5 mA at 200 % gives 10 mA', () => {
    // references.md 8.1, Toshiba "Characteristics of Photocouplers (CTR)": IF 5 mA, IC 10 mA -> 200 %
    const { operating } = phototransistorModel(stage({ rLed: undefined, ledCurrent: 5 * mA, ctrMin: 2 }))
    expect(operating.icAvailable / mA).toBeCloseTo(10, 12)
  })

  it('LED resistor 760 ohm from 5 V with VF 1.2 V gives 5 mA; the driver drop comes off the drive', () => {
    // references.md 8.2 [S/D]: RIN = (V_drive - VF - V_OL,driver) / IF = (5 - 1.2 - 0) / 5 mA = 760 ohm
    const { operating } = phototransistorModel(stage({ rLed: 760 }))
    expect(operating.ledCurrent / mA).toBeCloseTo(5, 12)
    // the same formula with a pin's 0.4 V V_OL (common practice for a microcontroller pin): 3.4 V / 760 ohm
    expect(phototransistorModel(stage({ rLed: 760, driverDrop: undefined })).operating.ledCurrent / mA).toBeCloseTo(3.4 / 0.76, 9)
    // a transistor switch drops about 0.2 V (common practice)
    expect(phototransistorModel(stage({ rLed: 760, driverDrop: undefined, driver: 'transistor' })).operating.ledCurrent / mA).toBeCloseTo(3.6 / 0.76, 9)
  })

  it('a logic pin has a current limit by default; a transistor driver does not', () => {
    // issue 18: 23 mA from a microcontroller pin is over its usual 20 mA limit (common practice)
    const pin = phototransistorModel(stage({ rLed: undefined, ledCurrent: 23 * mA }))
    expect(pin.warnings.filter((w) => w.code === 'absolute-maximum').map((w) => w.message).join(' ')).toMatch(/Driving pin current/)
    const sw = phototransistorModel(stage({ rLed: undefined, ledCurrent: 23 * mA, driver: 'transistor' }))
    expect(sw.warnings.map((w) => w.code)).not.toContain('absolute-maximum')
  })

  it('saturation bound RL >= (VCC - VCE(sat)) / (CTR IF): 1160 ohm at 50 %, 5 mA, 3.3 V', () => {
    // references.md 8.2 [D]: rlMin(3.3 V, 0.4 V, CTR 0.5, 5 mA) = 1160 ohm
    const at = (rl: number) => phototransistorModel(stage({ rLed: 760, ctrMin: 0.5, vcc: 3.3, vceSat: 0.4, rl })).operating
    expect(at(1160).overdrive).toBeCloseTo(1, 12)
    expect(at(1200).saturated).toBe(true)
    expect(at(1100).saturated).toBe(false)
  })

  it('derating multiplies the CTR', () => {
    // timing-model.md 5: IC_avail = CTR_min * derating * IF
    const { operating } = phototransistorModel(stage({ ctrDerating: { temperature: 0.8, endOfLife: 0.5 } }))
    expect(operating.icAvailable).toBeCloseTo(0.2 * 0.8 * 0.5 * ((5 - 1.2) / 160), 15)
  })

  it('a base-emitter resistor takes hFE x VBE / RBE from the available collector current', () => {
    // timing-model.md 5: IC_avail = CTR_min * derating * IF less VBE/RBE times the gain
    const { operating } = phototransistorModel(stage({ rbe: 470e3, hfe: 400 }))
    expect(operating.icAvailable).toBeCloseTo(0.2 * ((5 - 1.2) / 160) - (400 * VBE_HIGH) / 470e3, 15)
    // without hfe the stated default gain applies, and the warning says so
    const d = phototransistorModel(stage({ rbe: 470e3 }))
    expect(d.operating.icAvailable).toBeCloseTo(0.2 * ((5 - 1.2) / 160) - (DEFAULT_HFE * VBE_HIGH) / 470e3, 15)
    expect(d.warnings.map((w) => w.message).join(' ')).toMatch(/hfe is not given/)
  })

  it('warns when the output does not saturate and shrinks the swing', () => {
    const r = phototransistorModel(stage({ rLed: 1000 })) // 3.8 mA * 0.2 = 0.76 mA < 4.08 mA
    expect(r.operating.saturated).toBe(false)
    expect(codes(r.warnings)).toContain('unsaturated')
    expect(r.model.vLow).toBeCloseTo(5 - 0.76 * mA * 1200, 9)
    expect(r.model.vHigh).toBe(5)
    const ok = phototransistorModel(stage())
    expect(codes(ok.warnings)).not.toContain('unsaturated')
    expect([ok.model.vLow, ok.model.vHigh]).toEqual([0.1, 5]) // swing VCE(sat)..VCC
  })

  it('reports each absolute maximum that is exceeded', () => {
    const r = phototransistorModel(
      stage({ ledCurrentMax: 20 * mA, collectorCurrentMax: 4 * mA, powerMax: 0.02, driverCurrentMax: 10 * mA }),
    )
    const msgs = r.warnings.filter((w) => w.code === 'absolute-maximum').map((w) => w.message)
    expect(msgs.length).toBe(4)
    expect(msgs.join(' ')).toMatch(/LED current/)
    expect(msgs.join(' ')).toMatch(/Collector current/)
    expect(msgs.join(' ')).toMatch(/power/)
    expect(msgs.join(' ')).toMatch(/Driving pin/)
    // LED 23.75 mA * 1.2 V + transistor 0.1 V * 4.08 mA
    expect(r.operating.power).toBeCloseTo(0.02375 * 1.2 + 0.1 * (4.9 / 1200), 12)
    const fine = phototransistorModel(stage({ ledCurrentMax: 50 * mA, collectorCurrentMax: 50 * mA, powerMax: 0.2, driverCurrentMax: 25 * mA }))
    expect(codes(fine.warnings)).not.toContain('absolute-maximum')
  })
})

describe('inversion and edge shapes', () => {
  it.each([
    ['collector', 'high', true],
    ['collector', 'low', false],
    ['emitter', 'high', false],
    ['emitter', 'low', true],
  ] as const)('%s wiring, LED lit when %s -> inverting %s', (wiring, ledOnWhen, inverting) => {
    // timing-model.md 1 and 5: collector pull-up inverts, emitter follower does not; an LED lit by low flips it
    expect(phototransistorModel(stage({ wiring, ledOnWhen })).model.inverting).toBe(inverting)
  })
  it('the passive direction follows the wiring', () => {
    const c = phototransistorModel(stage({ wiring: 'collector' })).model
    expect([c.riseShape, c.fallShape]).toEqual(['exponential', 'ramp'])
    const e = phototransistorModel(stage({ wiring: 'emitter' })).model
    expect([e.riseShape, e.fallShape]).toEqual(['ramp', 'exponential'])
    expect([e.vLow, e.vHigh]).toEqual([0, 4.9])
  })
})

describe('switching times from the calibrated charge-control model', () => {
  it('reproduces its characterisation points and reports the fit', () => {
    for (const [i, p] of stage().characterization.entries()) {
      const r = phototransistorModel(stage({ rl: p.rl, rLed: undefined, ledCurrent: 20 * mA, ctrTyp: 0.75 }))
      const rel = (a: number, b: number) => Math.abs(a / b - 1)
      // two points, four parameters per quantity set: least squares leaves a small residual
      expect(rel(r.model.tplh.typ, p.tplh!)).toBeLessThan(0.1)
      expect(rel(r.model.tr.typ, p.tr!)).toBeLessThan(0.1)
      expect(r.coupler.fit.points).toBe(2)
      expect(r.coupler.fit.values).toBe(8)
      expect(r.coupler.fit.residuals[i]!.tplh).toBeDefined()
    }
  })

  it('one point is enough, and the slow edge is not scaled with RL', () => {
    // timing-model.md 5: from a 4.7 kOhm point the old proportional rule predicted a third of the real tPLH at 1.2 kOhm
    const one = { characterization: [{ rl: 4700, ledCurrent: 10 * mA, loadCap: 0, tplh: 25 * us, tphl: 1.75 * us, tr: 14 * us, tf: 2 * us }], ctrTyp: 0.75 }
    const at = phototransistorModel(stage({ ...one, rl: 1200, rLed: undefined, ledCurrent: 20 * mA }))
    // common practice (timing-model.md 5): about 18-20 us and about 4 us at 1.2 kOhm, 20 mA
    expect(at.model.tplh.typ / us).toBeGreaterThan(14)
    expect(at.model.tplh.typ / us).toBeLessThan(24)
    expect(at.model.tr.typ / us).toBeGreaterThan(3.2)
    expect(at.model.tr.typ / us).toBeLessThan(4.8)
    // turn-on barely moves (common practice: tPHL about 1.5-2 us, tf about 2 us)
    expect(at.model.tphl.typ / us).toBeGreaterThan(1.2)
    expect(at.model.tf.typ / us).toBeGreaterThan(1.2)
    expect(at.warnings.map((w) => w.code)).toContain('extrapolation')
  })

  it('outside the characterised range the slow corners are held at the nearest edge', () => {
    // issue 18: below the range the worst case is never faster than the model at the range's edge
    const two = { characterization: [{ rl: 1200, ledCurrent: 10 * mA, loadCap: 0, tplh: 19 * us, tr: 4 * us }, { rl: 4700, ledCurrent: 10 * mA, loadCap: 0, tplh: 25 * us, tr: 14 * us }] }
    const edge = phototransistorModel(stage({ ...two, rl: 1200, rLed: undefined, ledCurrent: 10 * mA }))
    const below = phototransistorModel(stage({ ...two, rl: 470, rLed: undefined, ledCurrent: 10 * mA }))
    expect(below.model.tplh.max).toBeGreaterThanOrEqual(edge.model.tplh.typ * (1 + TYPICAL_SPREAD) * (1 - 1e-9))
    expect(below.model.tplh.min).toBeLessThanOrEqual(below.model.tplh.typ)
    expect(below.warnings.map((w) => w.code)).toContain('extrapolation')
  })

  it('a heavier load slows the passive rise by about ln 9 x RL x the added capacitance', () => {
    // timing-model.md 5 and references.md 5.2: the load adds to the Miller capacitance, RC ln 9 on the 10-90 % rise
    const base = phototransistorModel(stage({ rl: 4700 })).model
    const heavy = phototransistorModel(stage({ rl: 4700, loadCap: 1e-9 })).model
    const added = heavy.tr.typ - base.tr.typ
    expect(added / (Math.log(9) * 4700 * 1e-9)).toBeGreaterThan(0.9)
    expect(added / (Math.log(9) * 4700 * 1e-9)).toBeLessThan(1.1)
    expect(heavy.tplh.typ).toBeGreaterThan(base.tplh.typ)
    // points without their own load are taken unloaded, not at the stage's load
    const noLoad = stage().characterization.map(({ loadCap: _, ...p }) => p)
    expect(phototransistorModel(stage({ rl: 4700, loadCap: 1e-9, characterization: noLoad })).model.tr.typ).toBeCloseTo(heavy.tr.typ, 12)
  })

  it('a base-emitter resistor shortens the storage and the rise', () => {
    // timing-model.md 5: RBE removes base charge actively: shorter storage, smaller effective gain
    const open = phototransistorModel(stage({ rl: 4700, ctrTyp: 0.75, hfe: 500 }))
    const rbe = phototransistorModel(stage({ rl: 4700, ctrTyp: 0.75, hfe: 500, rbe: 220e3 }))
    expect(rbe.coupler.storage).toBeLessThan(open.coupler.storage)
    expect(rbe.model.tplh.typ).toBeLessThan(open.model.tplh.typ)
    expect(rbe.model.tr.typ).toBeLessThan(open.model.tr.typ)
    expect(rbe.operating.icAvailable).toBeLessThan(open.operating.icAvailable)
  })

  it('without a typical CTR the stated multiple is used and the corners cover the bracket', () => {
    const r = phototransistorModel(stage({ rl: 4700 }))
    expect(r.coupler.ctrTypAssumed).toBe(true)
    expect(r.coupler.ctrTyp).toBeCloseTo(CTR_TYP_MULTIPLE * 0.2, 12)
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/Typical CTR not given/)
    const given = phototransistorModel(stage({ rl: 4700, ctrTyp: CTR_TYP_MULTIPLE * 0.2 }))
    expect(r.model.tplh.typ).toBeCloseTo(given.model.tplh.typ, 12)
    expect(r.model.tplh.max).toBeGreaterThanOrEqual(given.model.tplh.max)
  })

  it('corners: partSkew around typ when given, else the typical spread; typ always inside', () => {
    const d = phototransistorModel(stage({ rl: 4000, ctrTyp: 0.75 })).model
    expect(d.tplh.min).toBeCloseTo(d.tplh.typ * (1 - TYPICAL_SPREAD), 12)
    expect(d.tplh.max).toBeGreaterThanOrEqual(d.tplh.typ * (1 + TYPICAL_SPREAD))
    expect(d.tr.max).toBeGreaterThanOrEqual(d.tr.typ * (1 + TYPICAL_SPREAD))
    const s = phototransistorModel(stage({ rl: 4000, ctrTyp: 0.75, partSkew: 4 * us })).model
    expect(s.tplh.typ - s.tplh.min).toBeCloseTo(2 * us, 9)
    expect(s.partSkew).toBe(4 * us)
  })

  it('a point with only tPLH and tPHL gets realistic tr and tf, never an RC edge of the whole delay or 0', () => {
    // issue 18: tr was taken as tPLH x ln 9 / ln 2 (79 us from 25 us); such a coupler shows about 14 us (common practice)
    const r = phototransistorModel(stage({ rl: 4700, rLed: undefined, ledCurrent: 10 * mA, characterization: [{ rl: 4700, ledCurrent: 10 * mA, tplh: 25 * us, tphl: 2 * us }] }))
    expect(r.model.tr.typ / us).toBeGreaterThan(7)
    expect(r.model.tr.typ / us).toBeLessThan(20)
    expect(r.model.tf.typ / us).toBeGreaterThan(0.5)
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/tr, tf are not characterised/)
  })

  it('rejects points that cannot be right, naming the field', () => {
    // tPLH below the 50 % share of tr: the passive edge reaches 50 % after ln 2 / ln 9 of its 10-90 % time
    const low = PhototransistorStage.safeParse({ ...stage(), characterization: [{ rl: 4700, tplh: 2 * us, tr: 14 * us }] })
    expect(low.success).toBe(false)
    expect(low.error!.issues[0]!.path).toEqual(['characterization', 0, 'tplh'])
    // two points at indistinguishable conditions (issue 18: 1000 and 1000.01 ohm)
    const twin = PhototransistorStage.safeParse({ ...stage(), characterization: [{ rl: 1000, tplh: 10 * us }, { rl: 1000.01, tplh: 11 * us }] })
    expect(twin.success).toBe(false)
    expect(twin.error!.issues[0]!.path).toEqual(['characterization', 1, 'rl'])
    // an RBE that takes more than the typical photocurrent: the output never switches
    const rbe = PhototransistorStage.safeParse({ ...stage(), rbe: 1000 })
    expect(rbe.success).toBe(false)
    expect(rbe.error!.issues[0]!.path).toEqual(['rbe'])
    // a zero time is not a measurement
    expect(PhototransistorStage.safeParse({ ...stage(), characterization: [{ rl: 4700, tplh: 0 }] }).success).toBe(false)
  })

  it('never returns NaN or infinity, and typ lies within its corners (property)', () => {
    const time = fc.option(fc.double({ min: 1e-8, max: 1e-3, noNaN: true }), { nil: undefined })
    const point = fc.record({ rl: fc.double({ min: 10, max: 1e6, noNaN: true }), tplh: time, tphl: time, tr: time, tf: time })
    fc.assert(
      fc.property(
        fc.record({
          wiring: fc.constantFrom('collector', 'emitter'),
          ledOnWhen: fc.constantFrom('high', 'low'),
          driveVoltage: fc.double({ min: 0, max: 24, noNaN: true }),
          vf: fc.double({ min: 0, max: 3, noNaN: true }),
          rLed: fc.double({ min: 1, max: 1e5, noNaN: true }),
          ctrMin: fc.double({ min: 0.001, max: 5, noNaN: true }),
          vcc: fc.double({ min: 0.5, max: 30, noNaN: true }), // the schema's range
          rl: fc.double({ min: 1, max: 1e6, noNaN: true }),
          vceSat: fc.double({ min: 0, max: 1, noNaN: true }),
          loadCap: fc.double({ min: 0, max: 1e-8, noNaN: true }),
          characterization: fc.array(point, { minLength: 1, maxLength: 3 }),
        }),
        (over) => {
          const parsed = PhototransistorStage.safeParse({ ...stage(), ...over })
          fc.pre(parsed.success)
          const r = phototransistorModel(parsed.data)
          const nums = JSON.stringify(r, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? 'BAD' : v))
          expect(nums).not.toContain('BAD')
          for (const q of ['tplh', 'tphl'] as const) {
            expect(r.model[q].min).toBeLessThanOrEqual(r.model[q].typ)
            expect(r.model[q].typ).toBeLessThanOrEqual(r.model[q].max)
          }
          expect(r.model.tr.typ).toBeGreaterThanOrEqual(0)
          expect(r.model.tr.typ).toBeLessThanOrEqual(r.model.tr.max)
        },
      ),
      { numRuns: 60 },
    )
  })
})
