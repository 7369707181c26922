import { describe, expect, it } from 'vitest'
import { stateLevels } from '../../../../server/captures/levels'
import { gaussian, sampleWave, nrzEdges } from '../../../factories/captures'

const rangeOf = (v: ArrayLike<number>) => {
  let min = Infinity
  let max = -Infinity
  for (let i = 0; i < v.length; i++) {
    min = Math.min(min, v[i]!)
    max = Math.max(max, v[i]!)
  }
  return { min, max }
}

describe('IEEE 181 histogram state levels', () => {
  it('a 0 / 3.3 V two-level waveform with a 10 % overshoot spike still gives 0 and 3.3 V', () => {
    // IEEE Std 181 via references.md 5.1 (test suggestion [D]): the mode ignores the overshoot peak
    const v = new Float64Array(4000)
    for (let i = 0; i < v.length; i++) v[i] = i < 2000 ? 0 : 3.3
    // overshoot spike right after the step: peaks at 3.63 V (10 %) and decays over 40 samples
    for (let i = 0; i < 40; i++) v[2000 + i] = 3.3 + 0.33 * Math.exp(-i / 10)
    const l = stateLevels(v, rangeOf(v))!
    expect(l.low).toBeCloseTo(0, 3)
    expect(l.high).toBeCloseTo(3.3, 3)
    // reference levels as percent of the state levels, 10 / 50 / 90 % (references.md 5.1)
    expect(l.ref10).toBeCloseTo(0.33, 3)
    expect(l.ref50).toBeCloseTo(1.65, 3)
    expect(l.ref90).toBeCloseTo(2.97, 3)
  })

  it('the mean of the extremes would be fooled by the spike; the modes are not', () => {
    // common practice: min/max state levels are the naive method the histogram replaces
    const v = new Float64Array(2000).map((_, i) => (i % 1000 < 500 ? 0 : 3.3))
    v[700] = 4.3 // a large 30 % glitch
    v[100] = -1
    const l = stateLevels(v, rangeOf(v))!
    expect(l.high).toBeCloseTo(3.3, 6)
    expect(l.low).toBeCloseTo(0, 6)
    expect(l.amplitude).toBeCloseTo(3.3, 6)
  })

  it('noisy levels are found within a small fraction of the noise and the noise is estimated', () => {
    // common practice: Gaussian noise 30 mV rms on 0.2 / 4.8 V levels, 200 000 samples
    const edges = nrzEdges(200, 1e-5, 1e-5, 5)
    const v = sampleWave(200_000, 0, 1e-8, { edges, low: 0.2, high: 4.8, rise: { kind: 'ramp', duration: 1e-7 }, fall: { kind: 'ramp', duration: 1e-7 }, noiseRms: 0.03, seed: 9 })
    const l = stateLevels(v, rangeOf(v))!
    expect(Math.abs(l.low - 0.2)).toBeLessThan(0.005)
    expect(Math.abs(l.high - 4.8)).toBeLessThan(0.005)
    expect(l.noiseLow).toBeGreaterThan(0.025)
    expect(l.noiseLow).toBeLessThan(0.035)
    expect(l.noiseHigh).toBeGreaterThan(0.025)
    expect(l.noiseHigh).toBeLessThan(0.035)
  })

  it('a flat channel has no state levels', () => {
    // common practice: no two levels, nothing to measure (and no NaN)
    const v = new Float64Array(100).fill(1.2)
    expect(stateLevels(v, rangeOf(v))).toBeNull()
  })

  it('the levels do not depend on the bin count for flat levels with noise-free data', () => {
    // common practice: the refinement makes flat levels exact whatever the bin count
    const g = gaussian(1)
    const v = new Float64Array(10_000).map((_, i) => (i % 2000 < 1000 ? 0.1 : 3.0) + (i % 97 === 0 ? 0.05 * g() : 0))
    for (const bins of [20, 100, 1000]) {
      const l = stateLevels(v, rangeOf(v), bins)!
      expect(l.low).toBeCloseTo(0.1, 3)
      expect(l.high).toBeCloseTo(3.0, 3)
    }
  })
})
