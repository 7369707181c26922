import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import type { z } from 'zod'
import { ChannelSpec } from '../../../../shared/schemas/link'
import { analyzeChain } from '../../../../server/timing/chain'
import { digital, LVCMOS33, ns } from './fixtures'

type Input = z.input<typeof ChannelSpec>
const chainOf = (stages: Input['stages'], receiver: Input['receiver'] = LVCMOS33) =>
  analyzeChain(ChannelSpec.parse({ id: 'c', role: 'uart', stages, receiver }))

const RC = 1e3 * 1e-9 // 1 kOhm, 1 nF
const rc = (passive: 'rise' | 'fall') => ({ kind: 'rc' as const, name: 'pull-up and load', r: 1e3, c: 1e-9, passive })

describe('passive RC edge at the receiving pin', () => {
  it('rise time RC ln 9, 50 % delay RC ln 2', () => {
    const c = chainOf([digital(0, 0), rc('rise')])
    expect(c.tr.typ / RC).toBeCloseTo(2.1972246, 6) // references.md 5.2: RC ln 9
    expect(c.rise.typ / RC).toBeCloseTo(0.6931472, 6) // references.md 5.2: RC ln 2
    expect(c.riseShape).toBe('exponential')
    expect(c.fall.max).toBe(0) // the driven direction passes the driver's ideal edge on
  })

  it('an LVCMOS33 input sees the passive rise between its VIL and VIH crossings', () => {
    const c = chainOf([digital(0, 0), rc('rise')])
    expect(c.rise.max / RC).toBeCloseTo(0.93156, 5) // references.md 5.2: RC ln(3.3/1.3), VIH 2.0 V
    expect(c.rise.min / RC).toBeCloseTo(Math.log(3.3 / 2.5), 9) // [D] from references.md 5.2: t(x) = -RC ln(1 - x), VIL 0.8 V
    const f = chainOf([digital(0, 0), rc('fall')])
    expect(f.fall.max / RC).toBeCloseTo(1.41707, 5) // references.md 5.2: RC ln(3.3/0.8), VIL 0.8 V
  })

  it('a 0.3 / 0.7 VDD input spans RC ln(7/3) of the passive rise', () => {
    const c = chainOf([digital(0, 0), rc('rise')], { vdd: 5, vil: 1.5, vih: 3.5 })
    expect(c.rise.min / RC).toBeCloseTo(0.3566749, 6) // references.md 3: UM10204 t1 at 0.3 VDD
    expect((c.rise.max - c.rise.min) / RC).toBeCloseTo(0.8472979, 6) // references.md 3: UM10204 0.8473 RC
  })

  it('a Schmitt input times the rise at VT+ and the fall at VT-', () => {
    // references.md 8.5: CD74HCT14 at 4.5 V, VT+ 1.2..1.9 V, VT- 0.5..1.2 V
    const rx = { vdd: 4.5, vih: 2.0, vil: 0.8, schmitt: true, vtPlus: { min: 1.2, max: 1.9 }, vtMinus: { min: 0.5, max: 1.2 } }
    const c = chainOf([digital(0, 0), rc('rise')], rx)
    expect(c.rise.min / RC).toBeCloseTo(Math.log(4.5 / 3.3), 9) // [D] references.md 5.2 riseTo(1.2 V of 4.5 V)
    expect(c.rise.max / RC).toBeCloseTo(Math.log(4.5 / 2.6), 9) // [D] riseTo(1.9 V)
  })

  it('a slow edge into a non-Schmitt input is flagged', () => {
    const c = chainOf([digital(0, 0), rc('rise')], { ...LVCMOS33, maxInputTransition: 1e-6 })
    expect(c.warnings.map((w) => w.code)).toContain('slow-edge') // timing-model.md 8: slow edge into a non-Schmitt input
    const s = chainOf([digital(0, 0), rc('rise')], { ...LVCMOS33, maxInputTransition: 1e-6, schmitt: true, vtPlus: 1.8, vtMinus: 1.0 })
    expect(s.warnings.map((w) => w.code)).not.toContain('slow-edge')
  })
})

describe('chain PWD', () => {
  it('PWD of one stage is tPLH - tPHL, flipped by a later inverting stage', () => {
    // references.md 8.3: PWD = |tPHL - tPLH| = 8 ns for 40 / 32 ns
    const one = chainOf([digital(40 * ns, 32 * ns)])
    expect(one.pwd.min / ns).toBeCloseTo(8, 9)
    expect(one.pwd.max / ns).toBeCloseTo(8, 9)
    // timing-model.md section 1: the sign flips when an odd number of inverting stages follows
    const flipped = chainOf([digital(40 * ns, 32 * ns), digital(10 * ns, 10 * ns, { inverting: true })], { ...LVCMOS33, invert: true })
    expect(flipped.pwd.max / ns).toBeCloseTo(-8, 9)
    expect(flipped.polarity).toBe('inverted')
    expect(flipped.rise.typ / ns).toBeCloseTo(32 + 10, 9)
  })

  it('PWD max tightens the corners of one part', () => {
    // timing-model.md section 1: a stated PWD max bounds |tPLH - tPHL| below the corners
    const corners = { min: 20 * ns, typ: 30 * ns, max: 40 * ns }
    const loose = chainOf([{ ...digital(0, 0), tplh: corners, tphl: corners }])
    expect(loose.pwd.max / ns).toBeCloseTo(20, 9)
    const tight = chainOf([{ ...digital(0, 0), tplh: corners, tphl: corners, pwdMax: 5 * ns }])
    expect(tight.pwd.min / ns).toBeCloseTo(-5, 9)
    expect(tight.pwd.max / ns).toBeCloseTo(5, 9)
    // the delays themselves keep their corners
    expect(tight.rise.max / ns).toBeCloseTo(40, 9)
  })

  it('a PWD max the corners cannot meet is flagged and the corners win', () => {
    const c = chainOf([digital(40 * ns, 10 * ns, { pwdMax: 5 * ns })])
    expect(c.warnings.find((w) => w.stage === 0)!.message).toMatch(/PWD max/)
    expect(c.pwd.min / ns).toBeCloseTo(30, 9)
    expect(c.pwd.max / ns).toBeCloseTo(30, 9)
  })

  it('the inverted polarity warning names both fixes', () => {
    const c = chainOf([digital(10 * ns, 10 * ns, { inverting: true })])
    const w = c.warnings.find((x) => x.code === 'inverted-polarity')!
    expect(w.message).toMatch(/second inverting stage/)
    expect(w.message).toMatch(/receiver's inversion/)
  })

  it('a wire adds length x delay per metre to both edges', () => {
    const c = chainOf([{ kind: 'wire', name: 'cable', length: 2 }])
    expect(c.rise.typ / ns).toBeCloseTo(10, 9) // timing-model.md 1 / references.md 4.1: about 5 ns/m
    expect(c.pwd.max).toBe(0)
  })

  it('a threshold outside the swing is flagged and the channel marked unreachable', () => {
    const c = chainOf([digital(0, 0, { vHigh: 1.8 })])
    expect(c.reachable).toBe(false)
    expect(c.warnings.map((w) => w.code)).toContain('threshold-unreachable')
  })
})

const delay = fc.double({ min: 0, max: 1e-6, noNaN: true })
const transition = fc.double({ min: 0, max: 2e-7, noNaN: true }).map((t) => ({ typ: t, max: t }))
/**
 * Delay corners a real part can have with transition time t: its 50 % to 50 % delay is at
 * least 0.625 t, so no threshold crossing comes before the driving edge (a ramp crosses
 * 0 % of its swing 0.625 t before its 50 % point). Issue 18: corners that put an edge before
 * its cause are rejected.
 */
const causalCorners = (t: { max: number }) =>
  fc.tuple(delay, delay, delay).map((v) => v.map((x) => x + 0.625 * t.max).sort((a, b) => a - b)).map(([min, typ, max]) => ({ min: min!, typ: typ!, max: max! }))

describe('chain properties', () => {
  it('symmetric delays with fast edges give zero PWD', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(delay, fc.boolean()), { minLength: 1, maxLength: 6 }), (st) => {
        const c = chainOf(st.map(([d, inv]) => digital(d, d, { inverting: inv })), { ...LVCMOS33, invert: st.filter(([, i]) => i).length % 2 === 1 })
        expect(Math.abs(c.pwd.min)).toBeLessThan(1e-18)
        expect(Math.abs(c.pwd.max)).toBeLessThan(1e-18)
      }),
      { numRuns: 100 },
    )
  })

  it('symmetric delays with 50 % thresholds give zero PWD whatever the edges', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(delay, fc.boolean(), transition, fc.constantFrom('ramp' as const, 'exponential' as const)), { minLength: 1, maxLength: 5 }), (st) => {
        const c = chainOf(
          st.map(([d, inv, t, edge]) => digital(d, d, { inverting: inv, tr: t, tf: t, edge })),
          { vdd: 3.3, vil: 0.8, vih: 2.0, schmitt: true, vtPlus: 1.65, vtMinus: 1.65 },
        )
        expect(Math.abs(c.pwd.min)).toBeLessThan(1e-15)
        expect(Math.abs(c.pwd.max)).toBeLessThan(1e-15)
      }),
      { numRuns: 100 },
    )
  })

  it('two identical inverting stages in series cancel the nominal PWD', () => {
    const stage = fc
      .tuple(transition, transition)
      .chain(([tr, tf]) => fc.tuple(causalCorners(tr), causalCorners(tf), fc.constant(tr), fc.constant(tf)))
    fc.assert(
      fc.property(stage, fc.constantFrom('ramp' as const, 'exponential' as const), ([tplh, tphl, tr, tf], edge) => {
        const s = { kind: 'digital' as const, name: 'generic inverting buffer', inverting: true, tplh, tphl, tr, tf, edge }
        const c = chainOf([s, s])
        expect(Math.abs(c.pwdTyp)).toBeLessThan(1e-15)
        expect(c.polarity).toBe('kept')
      }),
      { numRuns: 100 },
    )
  })

  it('the PWD interval lies within the delay corners', () => {
    const stage = fc
      .tuple(transition, transition, fc.boolean())
      .chain(([tr, tf, inverting]) => fc.tuple(causalCorners(tr), causalCorners(tf), fc.constant(inverting), fc.constant(tr), fc.constant(tf)))
    fc.assert(
      fc.property(fc.array(stage, { minLength: 1, maxLength: 4 }), (st) => {
        const c = chainOf(st.map(([tplh, tphl, inverting, tr, tf]) => ({ kind: 'digital' as const, name: 'generic isolator', inverting, tplh, tphl, tr, tf })))
        expect(c.pwd.min).toBeGreaterThanOrEqual(c.rise.min - c.fall.max - 1e-15)
        expect(c.pwd.max).toBeLessThanOrEqual(c.rise.max - c.fall.min + 1e-15)
        expect(c.pwd.min).toBeLessThanOrEqual(c.pwdTyp + 1e-15)
        expect(c.pwdTyp).toBeLessThanOrEqual(c.pwd.max + 1e-15)
      }),
      { numRuns: 100 },
    )
  })
})
