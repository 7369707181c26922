import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { E12, E24, E48, E6, E96, nearest, nearestNotAbove, nearestNotBelow, seriesValues } from '../../../../server/timing/eseries'

describe('E series lists', () => {
  it('E12 is the IEC 60063 list', () => {
    // IEC 60063:2015, E12 series (references.md 7)
    expect([...E12]).toEqual([10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82])
  })
  it('E24 is the IEC 60063 list', () => {
    // IEC 60063:2015, E24 series (references.md 7)
    expect([...E24]).toEqual([10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91])
  })
  it('E96 is the IEC 60063 list and equals round(100*10^(i/96)) everywhere', () => {
    // IEC 60063:2015, E96 series (references.md 7, recomputed [D])
    expect(E96.length).toBe(96)
    expect(E96.slice(0, 5)).toEqual([100, 102, 105, 107, 110])
    expect(E96.slice(-4)).toEqual([909, 931, 953, 976])
    E96.forEach((v, i) => expect(v).toBe(Math.round(100 * 10 ** (i / 96))))
  })
  it('lengths', () => {
    // IEC 60063:2015 (references.md 7): E96 96, E24 24, E12 12
    expect([E6.length, E12.length, E24.length, E48.length, E96.length]).toEqual([6, 12, 24, 48, 96])
  })
  it('E24 departs from the formula at exactly the eight historical values', () => {
    // references.md 7 [D]: 27 (26), 30 (29), 33 (32), 36 (35), 39 (38), 43 (42), 47 (46), 82 (83)
    const off = E24.map((v, i) => [v, Math.round(10 * 10 ** (i / 24))] as const).filter(([v, f]) => v !== f)
    expect(off).toEqual([[27, 26], [30, 29], [33, 32], [36, 35], [39, 38], [43, 42], [47, 46], [82, 83]])
  })
  it('E6 and E48 are every second E12 / E96 value', () => {
    // references.md 7 [D]: E6 = 10 15 22 33 47 68; E48 list
    expect([...E6]).toEqual([10, 15, 22, 33, 47, 68])
    expect(E48.slice(0, 10)).toEqual([100, 105, 110, 115, 121, 127, 133, 140, 147, 154])
    expect(E48).not.toContain(102) // references.md 7: a code copy wrongly had 102 and 243
    expect(E48).not.toContain(243)
    expect(E48.slice(-6)).toEqual([750, 787, 825, 866, 909, 953])
  })
  it('largest neighbour ratio per series', () => {
    // references.md 7 [D]: E12 1.25 (12->15), E24 1.154 (13->15), E96 1.030 (133->137)
    const maxRatio = (s: readonly number[]) => Math.max(...s.map((v, i) => (i + 1 < s.length ? s[i + 1]! : s[0]! * 10) / v))
    expect(maxRatio(E12)).toBeCloseTo(1.25, 3)
    expect(maxRatio(E24)).toBeCloseTo(1.154, 3)
    expect(maxRatio(E96)).toBeCloseTo(1.03, 3)
  })
})

describe('values across decades', () => {
  it('E12 from 1 kOhm to 10 kOhm inclusive', () => {
    // IEC 60063:2015, E12 series
    expect(seriesValues('E12', 1000, 10000)).toEqual([1000, 1200, 1500, 1800, 2200, 2700, 3300, 3900, 4700, 5600, 6800, 8200, 10000])
  })
  it('E96 over three decades has 288 values and exact decimals', () => {
    const v = seriesValues('E96', 100, 97600)
    expect(v.length).toBe(288)
    expect(v).toContain(4.99e3)
    expect(seriesValues('E24', 0.1, 1)).toEqual([0.1, 0.11, 0.12, 0.13, 0.15, 0.16, 0.18, 0.2, 0.22, 0.24, 0.27, 0.3, 0.33, 0.36, 0.39, 0.43, 0.47, 0.51, 0.56, 0.62, 0.68, 0.75, 0.82, 0.91, 1])
  })
  it('an empty or bad range', () => {
    expect(seriesValues('E12', 5000, 5100)).toEqual([])
    expect(() => seriesValues('E12', 0, 10)).toThrow(/positive/)
  })
})

describe('nearest values', () => {
  it('published-number checks', () => {
    // references.md 7 [D]: nearest(4.6 k, E12) -> 4.7 k; nearest(1.77 k, E24) -> 1.8 k; nearest(966.67, E96, not below) -> 976
    expect(nearest(4600, 'E12')).toBe(4700)
    expect(nearest(1770, 'E24')).toBe(1800)
    expect(nearestNotBelow(966.67, 'E96')).toBe(976)
  })
  it('LED resistor that still gives at least 20 mA from 3.5 V is E24 160 ohm', () => {
    // common practice (issue 3): 3.5 V / 20 mA = 175 ohm -> the next lower E24 value 160 ohm
    expect(nearestNotAbove(3.5 / 0.02, 'E24')).toBe(160)
    expect(nearestNotBelow(175, 'E24')).toBe(180)
  })
  it('pull-up for saturation: RL >= 1160 ohm -> E24 1.2 k', () => {
    // references.md 8.2 [D]: RL >= 1.16 kOhm -> next E24 value up 1.2 kOhm
    expect(nearestNotBelow((3.3 - 0.4) / (0.5 * 5e-3), 'E24')).toBe(1200)
  })
  it('values on the series return themselves; decade edges wrap', () => {
    expect(nearestNotBelow(4700, 'E12')).toBe(4700)
    expect(nearestNotAbove(4700, 'E12')).toBe(4700)
    expect(nearestNotBelow(8300, 'E12')).toBe(10000)
    expect(nearestNotAbove(9900, 'E12')).toBe(8200)
    expect(nearest(9500, 'E12')).toBe(10000) // 9500/8200 = 1.159 > 10000/9500 = 1.053
  })
  it('brackets every positive value (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e9, noNaN: true }), fc.constantFrom('E6', 'E12', 'E24', 'E48', 'E96' as const), (x, s) => {
        const lo = nearestNotAbove(x, s)
        const hi = nearestNotBelow(x, s)
        expect(lo).toBeLessThanOrEqual(x * (1 + 1e-9))
        expect(hi).toBeGreaterThanOrEqual(x * (1 - 1e-9))
        expect(hi / lo).toBeLessThan(1.51) // no gap wider than the E6 step 1.5
        expect([lo, hi]).toContain(nearest(x, s))
      }),
    )
  })
})
