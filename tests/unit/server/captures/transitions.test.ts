import { describe, expect, it } from 'vitest'
import { stateLevels } from '../../../../server/captures/levels'
import { findEdges } from '../../../../server/captures/transitions'
import { nrzEdges, sampleWave } from '../../../factories/captures'

const rangeOf = (v: ArrayLike<number>) => {
  let min = Infinity
  let max = -Infinity
  for (let i = 0; i < v.length; i++) {
    min = Math.min(min, v[i]!)
    max = Math.max(max, v[i]!)
  }
  return { min, max }
}
const grid = (n: number, t0: number, dt: number) => new Float64Array(n).map((_, i) => t0 + i * dt)

describe('transitions', () => {
  it('a linear 0-3.3 V ramp over 1 us between flat levels: 10-90 % is 0.8 us, 50 % at 0.5 us', () => {
    // IEEE Std 181 via references.md 5.1 (test suggestion [D]); samples every 10 ns, ramp from t = 0
    const t = grid(400, -1e-6, 1e-8) // -1 us .. 3 us
    const v = t.map((x) => (x <= 0 ? 0 : x >= 1e-6 ? 3.3 : 3.3 * (x / 1e-6)))
    const l = stateLevels(v, rangeOf(v))!
    expect(l.low).toBeCloseTo(0, 3)
    expect(l.high).toBeCloseTo(3.3, 3)
    const { edges } = findEdges(t, v, l)
    expect(edges).toHaveLength(1)
    const e = edges[0]!
    expect(e.polarity).toBe('rising')
    expect(e.duration!).toBeCloseTo(0.8e-6, 9) // within 1 ns
    expect(e.t50).toBeCloseTo(0.5e-6, 9)
    expect(e.t10!).toBeCloseTo(0.1e-6, 9)
    expect(e.t90!).toBeCloseTo(0.9e-6, 9)
  })

  it('the falling ramp mirrored: 90-10 % 0.8 us, 50 % at 0.5 us, falling polarity', () => {
    // IEEE Std 181 via references.md 5.1 (the same suggestion, falling)
    const t = grid(400, -1e-6, 1e-8)
    const v = t.map((x) => (x <= 0 ? 3.3 : x >= 1e-6 ? 0 : 3.3 * (1 - x / 1e-6)))
    const { edges } = findEdges(t, v, stateLevels(v, rangeOf(v))!)
    expect(edges).toHaveLength(1)
    expect(edges[0]!.polarity).toBe('falling')
    expect(edges[0]!.duration!).toBeCloseTo(0.8e-6, 9)
    expect(edges[0]!.t50).toBeCloseTo(0.5e-6, 9)
  })

  it('an exponential (RC) rising edge: 10-90 % = tau ln 9, 50 % at tau ln 2 after its start', () => {
    // references.md 5.2: rc.t10to90 = 2.1972246 RC [D], rc.t50 = 0.6931472 RC [D]
    const tau = 4.7e3 * 1e-9 // 4.7 kOhm x 1 nF
    const t = grid(20_000, -20e-6, 5e-9)
    const v = t.map((x) => (x <= 0 ? 0 : 3.3 * (1 - Math.exp(-x / tau))))
    const { edges } = findEdges(t, v, stateLevels(v, rangeOf(v))!)
    expect(edges).toHaveLength(1)
    // tolerance 2 %: the histogram's high state level sits a fraction of a bin below the
    // exponential's asymptote (the approach fills the top bins), which moves the 90 % instant
    expect(Math.abs(edges[0]!.duration! - 2.1972246 * tau)).toBeLessThan(0.02 * 2.1972246 * tau)
    expect(Math.abs(edges[0]!.t50 - 0.6931472 * tau)).toBeLessThan(0.005 * tau)
  })

  it('noise on the levels does not create false edges (hysteresis)', () => {
    // common practice: 100 mV rms noise (3 % of 3.3 V) crosses the 10 % and 50 % levels' neighbourhoods often
    const input = nrzEdges(300, 26e-6, 20e-6, 11)
    const n = 400_000
    const v = sampleWave(n, 0, 2e-8, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 2e-7 }, fall: { kind: 'ramp', duration: 2e-7 }, noiseRms: 0.1, seed: 2 })
    const t = grid(n, 0, 2e-8)
    const l = stateLevels(v, rangeOf(v))!
    const found = findEdges(t, v, l)
    const expected = input.filter((e) => e.t50 < (n - 1) * 2e-8)
    expect(found.edges.length).toBe(expected.length)
    found.edges.forEach((e, i) => {
      expect(e.polarity).toBe(expected[i]!.polarity)
      // common practice: the 50 % instant within noise/slope = 0.1 V / (2.64 V / 200 ns) ~ 8 ns; allow 4x
      expect(Math.abs(e.t50 - expected[i]!.t50)).toBeLessThan(32e-9)
    })
  })

  it('slow noisy edges: the hysteresis band keeps one edge per transition, a zero band does not', () => {
    // common practice: 5 us ramps with 50 mV rms noise cross the 50 % level many times each
    const input = nrzEdges(60, 100e-6, 50e-6, 4)
    const n = 320_000
    const v = sampleWave(n, 0, 2e-8, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 5e-6 }, fall: { kind: 'ramp', duration: 5e-6 }, noiseRms: 0.05, seed: 8 })
    const t = grid(n, 0, 2e-8)
    const l = stateLevels(v, rangeOf(v))!
    const expected = input.filter((e) => e.t50 < (n - 1) * 2e-8 - 5e-6)
    const found = findEdges(t, v, l)
    expect(found.edges.map((e) => e.polarity)).toEqual(expected.map((e) => e.polarity))
    for (const [i, e] of found.edges.entries()) {
      // common practice: the 10-90 % duration of a noisy 5 us ramp within 10 %
      expect(Math.abs(e.duration! - 5e-6)).toBeLessThan(0.5e-6)
      expect(Math.abs(e.t50 - expected[i]!.t50)).toBeLessThan(0.3e-6)
    }
    expect(findEdges(t, v, l, 0).edges.length).toBeGreaterThan(expected.length * 2)
  })

  it('edges cut by the start or end of the record keep their 50 % instant but no transition duration', () => {
    // common practice: a transition duration needs both reference level instants in the record
    const t = grid(300, 0, 1e-8)
    // starts mid-ramp going up (t10 before the record), ends mid-ramp going down (t10 after it)
    const v = t.map((x) => (x < 1e-6 ? Math.min(3.3, 1.0 + 3.3 * (x / 1e-6)) : Math.max(0.5, 3.3 - 3.3 * ((x - 2e-6) / 1e-6))))
    const l = { low: 0, high: 3.3, amplitude: 3.3, ref10: 0.33, ref50: 1.65, ref90: 2.97, noiseLow: 0, noiseHigh: 0, bins: 100 }
    const { edges } = findEdges(t, v, l)
    // the first edge is not seen at all: the record starts between the hysteresis thresholds
    expect(edges.map((e) => e.polarity)).toEqual(['falling'])
    expect(edges[0]!.t90).not.toBeNull()
    expect(edges[0]!.t10).toBeNull()
    expect(edges[0]!.duration).toBeNull()
  })
})
