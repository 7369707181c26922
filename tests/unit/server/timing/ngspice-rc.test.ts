/**
 * The RC part of a stage's output edge (pull-up or emitter resistor and load
 * capacitance, the switch modelled as ideal) against ngspice transient runs, for
 * several R and C, including the threshold crossings the engine uses.
 * ngspice is required: without it these tests fail with a plain message.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { RcStage } from '../../../../shared/schemas/link'
import { rcStageModel } from '../../../../server/timing/stages'
import { thresholdOffset } from '../../../../server/timing/edges'
import { requireNgspice, runRcEdges, type RcEdgeCase, type RcEdgeMeasured } from '../../../../bench/ngspice-rc'

const VLOW = 0.2 // VCE(sat)
const VCC = 3.3
const VIH = 2.0 // 3.3 V LVCMOS, references.md 8.4
const VIL = 0.8
const R = [1e3, 4.7e3, 10e3]
const C = [100e-12, 1e-9, 4.7e-9]
const grid = R.flatMap((r) => C.map((c) => ({ r, c })))
const lvl = (x: number) => VLOW + x * (VCC - VLOW)

function cases(): RcEdgeCase[] {
  return grid.map(({ r, c }) => ({
    r,
    c,
    vLow: VLOW,
    vHigh: VCC,
    riseLevels: { p10: lvl(0.1), p50: lvl(0.5), p90: lvl(0.9), vih: VIH, vil: VIL },
    // the falling (emitter-resistor) edge swings VCC..0
    fallLevels: { p90: 0.9 * VCC, p50: 0.5 * VCC, p10: 0.1 * VCC, vih: VIH, vil: VIL },
  }))
}

/** A pull-up (or pull-down) resistor charging the load after an ideal switch: the rc stage. */
function rcOnlyStage(passive: 'rise' | 'fall', r: number, c: number) {
  return RcStage.parse({ kind: 'rc', name: 'ideal switch and load (test)', r, c, passive, vLow: passive === 'rise' ? VLOW : 0, vHigh: VCC })
}

let measured: RcEdgeMeasured[] = []
beforeAll(() => {
  requireNgspice()
  measured = runRcEdges(cases())
}, 60_000)

// relative agreement: ngspice's step is held below tau/2000
const close = (engine: number, spice: number, scale: number) => expect(Math.abs(engine - spice)).toBeLessThanOrEqual(2e-3 * scale)

describe('RC edge of a stage output against ngspice', () => {
  it.each(grid.map((g, i) => [g.r, g.c, i] as const))('pull-up %s ohm, load %s F: tr and tPLH of the passive rise', (r, c, i) => {
    // timing-model.md 1 and 5: tr = RC ln 9 (2.197 RC), 50 % at RC ln 2 (references.md 5.2)
    const m = measured[i]!.rise
    const model = rcStageModel(rcOnlyStage('rise', r, c), VCC)
    const tau = r * c
    close(model.tr.typ, m.p90! - m.p10!, tau)
    close(model.tplh.typ, m.p50!, tau)
    expect(model.riseShape).toBe('exponential')
  })

  it.each(grid.map((g, i) => [g.r, g.c, i] as const))('emitter resistor %s ohm, load %s F: tf and tPHL of the passive fall', (r, c, i) => {
    const m = measured[i]!.fall
    const model = rcStageModel(rcOnlyStage('fall', r, c), VCC)
    const tau = r * c
    close(model.tf.typ, m.p10! - m.p90!, tau)
    close(model.tphl.typ, m.p50!, tau)
    expect(model.fallShape).toBe('exponential')
  })

  it.each(grid.map((g, i) => [g.r, g.c, i] as const))('%s ohm, %s F: receiver threshold crossings VIH / VIL relative to 50 %%', (r, c, i) => {
    // timing-model.md 1: exponential rising offset tau (ln(1/(1-x)) - ln 2), falling tau (ln(1/x) - ln 2)
    const { rise, fall } = measured[i]!
    const tau = r * c
    const tr = Math.log(9) * tau
    const xr = (v: number) => (v - VLOW) / (VCC - VLOW)
    close(thresholdOffset('rise', 'exponential', tr, xr(VIH)), rise.vih! - rise.p50!, tau)
    close(thresholdOffset('rise', 'exponential', tr, xr(VIL)), rise.vil! - rise.p50!, tau)
    const xf = (v: number) => v / VCC
    close(thresholdOffset('fall', 'exponential', tr, xf(VIL)), fall.vil! - fall.p50!, tau)
    close(thresholdOffset('fall', 'exponential', tr, xf(VIH)), fall.vih! - fall.p50!, tau)
  })

  it('matches the RC constants of references.md 5.2', () => {
    // references.md 5.2 [D]: riseTo(2.0 V of 3.3 V) = RC ln(3.3/1.3) = 0.93156 RC; fallTo(0.8 V from 3.3 V) = 1.41707 RC
    const [m] = runRcEdges([
      { r: 4.7e3, c: 1e-9, vLow: 0, vHigh: 3.3, riseLevels: { vih: 2.0 }, fallLevels: { vil: 0.8 } },
    ])
    const tau = 4.7e-6
    expect(m!.rise.vih! / tau).toBeCloseTo(0.93156, 3)
    expect(m!.fall.vil! / tau).toBeCloseTo(1.41707, 3)
    // stack.md: 4.7 kOhm, 1 nF measured 10.327 us against 2.197 RC = 10.326 us
    const [n] = runRcEdges([{ r: 4.7e3, c: 1e-9, vLow: 0, vHigh: 5, riseLevels: { a: 0.5, b: 4.5 }, fallLevels: {} }])
    expect((n!.rise.b! - n!.rise.a!) * 1e6).toBeCloseTo(10.327, 2)
  })
})
