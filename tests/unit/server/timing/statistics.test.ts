import { describe, expect, it } from 'vitest'
import { createRng, erfc, gaussianTail, histogram, normalCdf, normalQuantile, qFromBer, quantileSorted, totalJitter } from '../../../../server/timing/statistics'

describe('dual-Dirac jitter', () => {
  it('Q(1e-12) and total jitter at 1e-12', () => {
    expect(qFromBer(1e-12)).toBeCloseTo(7.0345, 4) // references.md 6: Q(1e-12) = 7.0345
    expect(totalJitter(20e-12, 2e-12, 1e-12) / 1e-12).toBeCloseTo(48.14, 2) // references.md 6: 20 + 14.069 x 2 ps
  })

  it('reproduces the 2Q column (DTD 0.5) of the BER table', () => {
    // references.md 6: IDT 8V41N012 datasheet Table 8, 2Q = 2 Phi^-1(1 - BER), printed to 3 decimals
    const table: [number, number][] = [
      [1e-3, 6.18], [1e-4, 7.438], [1e-5, 8.53], [1e-6, 9.507], [1e-7, 10.399], [1e-8, 11.224], [1e-9, 11.996],
      [1e-10, 12.723], [1e-11, 13.412], [1e-12, 14.069], [1e-13, 14.698], [1e-14, 15.301], [1e-15, 15.883],
    ]
    for (const [ber, twoQ] of table) expect(Math.abs(2 * qFromBer(ber) - twoQ)).toBeLessThanOrEqual(0.0006)
  })

  it('the DTD 1 column within its stated tolerance', () => {
    // references.md 6: second column = 2 Phi^-1(1 - BER/2), tolerance 0.002
    const table: [number, number][] = [[1e-3, 6.582], [1e-6, 9.784], [1e-9, 12.218], [1e-12, 14.26]]
    for (const [ber, twoQ] of table) expect(Math.abs(2 * qFromBer(ber / 2) - twoQ)).toBeLessThanOrEqual(0.002)
  })
})

describe('normal distribution', () => {
  it('known values', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6) // common practice: 97.5 % point of the standard normal
    expect(normalCdf(0)).toBe(0.5)
    expect(gaussianTail(3)).toBeCloseTo(1.3498980316e-3, 12) // common practice: P(Z > 3)
    expect(erfc(0.5)).toBeCloseTo(0.4795001221869535, 15) // common practice: erfc(0.5)
    expect(erfc(3)).toBeCloseTo(2.209049699858544e-5, 18) // common practice: erfc(3)
  })

  it('quantile and tail invert each other across many decades', () => {
    for (const p of [1e-20, 1e-15, 1e-9, 1e-4, 0.01, 0.3]) {
      const x = -normalQuantile(p)
      expect(gaussianTail(x) / p).toBeCloseTo(1, 9)
    }
  })
})

describe('seeded generator, quantiles, histogram', () => {
  it('the same seed gives the same sequence, another seed another', () => {
    const a = createRng(42)
    const b = createRng(42)
    const c = createRng(43)
    const sa = Array.from({ length: 5 }, () => a.next())
    expect(Array.from({ length: 5 }, () => b.next())).toEqual(sa)
    expect(Array.from({ length: 5 }, () => c.next())).not.toEqual(sa)
  })

  it('uniform and normal draws have the right moments and tails', () => {
    const r = createRng(7)
    let s = 0
    let s2 = 0
    let s4 = 0
    let beyond2 = 0
    let beyond3 = 0
    let u = 0
    const n = 400000
    for (let i = 0; i < n; i++) {
      const z = r.normal()
      s += z
      s2 += z * z
      s4 += z ** 4
      if (Math.abs(z) > 2) beyond2++
      if (z > 3) beyond3++
      u += r.next()
    }
    // common practice: standard normal mean 0, variance 1, fourth moment 3, P(|Z| > 2) = 0.0455, P(Z > 3) = 0.00135
    expect(Math.abs(s / n)).toBeLessThan(0.008) // about 5 standard errors
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.012)
    expect(Math.abs(s4 / n - 3)).toBeLessThan(0.08)
    expect(Math.abs(beyond2 / n - 2 * gaussianTail(2))).toBeLessThan(0.0017)
    expect(Math.abs(beyond3 / n - gaussianTail(3))).toBeLessThan(0.0003)
    expect(Math.abs(u / n - 0.5)).toBeLessThan(0.003)
  })

  it('quantiles interpolate between order statistics and the histogram counts everything', () => {
    const v = [1, 2, 3, 4, 5]
    expect(quantileSorted(v, 0.5)).toBe(3)
    expect(quantileSorted(v, 0.25)).toBe(2)
    expect(quantileSorted(v, 0.1)).toBeCloseTo(1.4, 12)
    const h = histogram(v, 4)
    expect(h.map((b) => b.count)).toEqual([1, 1, 1, 2])
    expect(h.reduce((a, b) => a + b.count, 0)).toBe(5)
  })
})
