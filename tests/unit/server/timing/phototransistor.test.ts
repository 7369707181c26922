import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { PhototransistorStage } from '../../../../shared/schemas/link'
import {
  fitCharacterization,
  fitLine,
  phototransistorModel,
  TYPICAL_SPREAD,
} from '../../../../server/timing/phototransistor'

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
    ctrMin: 0.2,
    vcc: 5,
    rl: 1200,
    vceSat: 0.1,
    characterization: [
      { rl: 1000, tplh: 6 * us, tphl: 3 * us, tr: 10 * us, tf: 2 * us },
      { rl: 10000, tplh: 42 * us, tphl: 4 * us, tr: 70 * us, tf: 3 * us },
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

  it('LED resistor 760 ohm from 5 V with VF 1.2 V gives 5 mA', () => {
    // references.md 8.2 [S/D]: RIN = (5 - 1.2) / 5 mA = 760 ohm
    const { operating } = phototransistorModel(stage({ rLed: 760 }))
    expect(operating.ledCurrent / mA).toBeCloseTo(5, 12)
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

describe('switching times from characterisation points', () => {
  it('fits t = a + b RL by least squares with its residual', () => {
    // ordinary least squares on (1, 2), (2, 3), (3, 5): b = 1.5, a = 1/3, residuals 1/6, -1/3, 1/6
    const f = fitLine('tr', [
      { rl: 1, t: 2 },
      { rl: 2, t: 3 },
      { rl: 3, t: 5 },
    ])
    expect(f.method).toBe('least-squares')
    expect(f.b).toBeCloseTo(1.5, 12)
    expect(f.a).toBeCloseTo(1 / 3, 12)
    expect(f.rmsResidual).toBeCloseTo(Math.sqrt((1 / 36 + 1 / 9 + 1 / 36) / 3), 12)
    expect(f.maxResidual).toBeCloseTo(1 / 3, 12)
  })

  it('interpolates on the fitted lines inside the range', () => {
    const r = phototransistorModel(stage({ rl: 4000 }))
    // tplh line: 6 us at 1 k, 42 us at 10 k -> 4 us/k slope, 2 us intercept
    expect(r.model.tplh.typ).toBeCloseTo(18 * us, 12)
    expect(r.model.tr.typ).toBeCloseTo(30 * us, 12)
    expect(r.model.tphl.typ).toBeCloseTo((3 + (1 / 9) * 3) * us, 12)
    expect(codes(r.warnings)).not.toContain('extrapolation')
    const fits = fitCharacterization(stage())
    expect(fits.tplh.rmsResidual).toBeCloseTo(0, 18)
    expect(fits.tplh.points).toBe(2)
  })

  it('warns when RL is outside the characterised range', () => {
    expect(codes(phototransistorModel(stage({ rl: 470 })).warnings)).toContain('extrapolation')
    expect(codes(phototransistorModel(stage({ rl: 22000, rLed: 100 })).warnings)).toContain('extrapolation')
    expect(codes(phototransistorModel(stage({ rl: 10000 })).warnings)).not.toContain('extrapolation')
  })

  it('one point scales with RL and says it is an extrapolation', () => {
    const r = phototransistorModel(stage({ rl: 2000, characterization: [{ rl: 1000, tplh: 6 * us, tphl: 3 * us, tr: 10 * us, tf: 2 * us }] }))
    expect(r.model.tplh.typ).toBeCloseTo(12 * us, 12)
    expect(r.model.tr.typ).toBeCloseTo(20 * us, 12)
    expect(codes(r.warnings)).toContain('single-point-fit')
    expect(codes(r.warnings)).toContain('extrapolation')
  })

  it('adds 2.197 RL dC to tr and 0.693 RL dC to tPLH for a heavier load (collector wiring)', () => {
    // timing-model.md 5 and references.md 5.2: RC ln 9 and RC ln 2
    const at0 = stage().characterization.map((p) => ({ ...p, loadCap: 0 })) // points taken unloaded
    const base = phototransistorModel(stage({ rl: 4700, characterization: at0 })).model
    const heavy = phototransistorModel(stage({ rl: 4700, loadCap: 100 * pF, characterization: at0 })).model
    expect(heavy.tr.typ - base.tr.typ).toBeCloseTo(Math.log(9) * 4700 * 100 * pF, 15)
    expect(heavy.tplh.typ - base.tplh.typ).toBeCloseTo(Math.LN2 * 4700 * 100 * pF, 15)
    expect(heavy.tf.typ).toBe(base.tf.typ)
    expect(heavy.tphl.typ).toBe(base.tphl.typ)
  })

  it('applies the load term to tf and tPHL in emitter wiring, and to points taken at another load', () => {
    const at0 = stage().characterization.map((p) => ({ ...p, loadCap: 0 }))
    const base = phototransistorModel(stage({ wiring: 'emitter', rl: 4700, characterization: at0 })).model
    const heavy = phototransistorModel(stage({ wiring: 'emitter', rl: 4700, loadCap: 50 * pF, characterization: at0 })).model
    expect(heavy.tf.typ - base.tf.typ).toBeCloseTo(Math.log(9) * 4700 * 50 * pF, 15)
    expect(heavy.tphl.typ - base.tphl.typ).toBeCloseTo(Math.LN2 * 4700 * 50 * pF, 15)
    expect(heavy.tr.typ).toBe(base.tr.typ)
    // points without their own load are taken at the stage's load (schema default): no correction
    expect(phototransistorModel(stage({ wiring: 'emitter', rl: 4700, loadCap: 50 * pF })).model.tf.typ).toBe(base.tf.typ)
    // points measured at 50 pF used on a 50 pF stage need no correction
    const pts = stage().characterization.map((p) => ({ ...p, loadCap: 50 * pF }))
    const same = phototransistorModel(stage({ wiring: 'emitter', rl: 4700, loadCap: 50 * pF, characterization: pts })).model
    expect(same.tf.typ).toBeCloseTo(base.tf.typ, 15)
  })

  it('corners: partSkew around typ when given, else the typical spread', () => {
    const d = phototransistorModel(stage({ rl: 4000 })).model
    expect(d.tplh.min).toBeCloseTo(18 * us * (1 - TYPICAL_SPREAD), 12)
    expect(d.tplh.max).toBeCloseTo(18 * us * (1 + TYPICAL_SPREAD), 12)
    expect(d.tr.max).toBeCloseTo(30 * us * (1 + TYPICAL_SPREAD), 12)
    const s = phototransistorModel(stage({ rl: 4000, partSkew: 4 * us })).model
    expect([s.tplh.min, s.tplh.typ, s.tplh.max].map((x) => x / us)).toEqual([16, 18, 20].map((x) => expect.closeTo(x, 9)))
    expect(s.partSkew).toBe(4 * us)
  })

  it('a missing quantity is estimated and warned about, never silently', () => {
    const r = phototransistorModel(stage({ characterization: [{ rl: 1000, tplh: 6 * us, tphl: 3 * us }, { rl: 4700, tplh: 20 * us, tphl: 3.5 * us }] }))
    expect(r.model.tr.typ).toBeCloseTo((r.model.tplh.typ * Math.log(9)) / Math.LN2, 15)
    expect(r.warnings.filter((w) => w.code === 'other').length).toBe(2) // tr estimated, tf taken as 0
  })

  it('never returns NaN or infinity for schema-valid stages (property)', () => {
    const time = fc.option(fc.double({ min: 1e-9, max: 1e-3, noNaN: true }), { nil: undefined })
    const point = fc.record({ rl: fc.double({ min: 1, max: 1e6, noNaN: true }), tplh: time, tphl: time, tr: time, tf: time })
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
          characterization: fc.array(point, { minLength: 1, maxLength: 5 }),
        }),
        (over) => {
          const r = phototransistorModel(stage(over))
          const nums = JSON.stringify(r, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? 'BAD' : v))
          expect(nums).not.toContain('BAD')
          expect(r.model.tplh.min).toBeLessThanOrEqual(r.model.tplh.max)
          expect(r.model.tr.typ).toBeGreaterThanOrEqual(0)
        },
      ),
    )
  })
})
