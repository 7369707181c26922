/**
 * Preferred-number series of IEC 60063:2015 (E series) for resistor choices.
 *
 * E12, E24 and E96 are the published lists (references.md section 7), not generated:
 * E24 keeps eight historical values that the formula round(10 * 10^(i/24)) would not
 * give. E6 is every second E12 value and E48 every second E96 value, both as the
 * standard lists them.
 */

export type SeriesName = 'E6' | 'E12' | 'E24' | 'E48' | 'E96'

/** IEC 60063 E12, mantissas of one decade (10 means 1.0). */
export const E12: readonly number[] = Object.freeze([10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82])

/** IEC 60063 E24, mantissas of one decade. */
export const E24: readonly number[] = Object.freeze([
  10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91,
])

/** IEC 60063 E96, mantissas of one decade (100 means 1.00). */
export const E96: readonly number[] = Object.freeze([
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158,
  162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255,
  261, 267, 274, 280, 287, 294, 301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412,
  422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665,
  681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
])

/** E6: every second E12 value. */
export const E6: readonly number[] = Object.freeze(E12.filter((_, i) => i % 2 === 0))
/** E48: every second E96 value, starting at 100. */
export const E48: readonly number[] = Object.freeze(E96.filter((_, i) => i % 2 === 0))

const MANTISSAS: Record<SeriesName, readonly number[]> = { E6, E12, E24, E48, E96 }

/** Mantissas of one decade of a series, as integers (two digits for E6-E24, three for E48/E96). */
export function seriesMantissas(series: SeriesName): readonly number[] {
  const m = MANTISSAS[series]
  if (!m) throw new Error(`unknown E series '${String(series)}'`)
  return m
}

/** Relative tolerance under which a value counts as equal to a standard value. */
const SAME = 1e-9

/** mantissa * 10^exp without binary-decimal noise (47 * 10^-1 is 4.7, not 4.699999...). */
function scaled(mantissa: number, exp: number): number {
  return exp >= 0 ? mantissa * 10 ** exp : mantissa / 10 ** -exp
}

/**
 * Every standard value of a series in [min, max] (inclusive, within 1e-9 relative),
 * across as many decades as needed, ascending.
 */
export function seriesValues(series: SeriesName, min: number, max: number): number[] {
  if (!(min > 0) || !(max > 0) || !Number.isFinite(min) || !Number.isFinite(max))
    throw new Error('series range: min and max must be positive finite numbers')
  if (min > max) return []
  const m = seriesMantissas(series)
  const digits = m[0]! // 10 or 100: the mantissa's decade scale
  const out: number[] = []
  const lo = min * (1 - SAME)
  const hi = max * (1 + SAME)
  const first = Math.floor(Math.log10(lo / digits)) - 1
  const last = Math.ceil(Math.log10(hi / digits)) + 1
  for (let e = first; e <= last; e++) {
    for (const mant of m) {
      const v = scaled(mant, e)
      if (v >= lo && v <= hi) out.push(v)
    }
  }
  return out
}

/** The standard values just below-or-at and just above-or-at a positive value (no allocation: sweeps call it per row). */
function bracket(value: number, series: SeriesName): { below: number; above: number } {
  if (!(value > 0) || !Number.isFinite(value)) throw new Error('series lookup: value must be a positive finite number')
  const m = seriesMantissas(series)
  const e = Math.floor(Math.log10(value / m[0]!))
  const hi = value * (1 + SAME)
  const lo = value * (1 - SAME)
  let below = 0
  let above = Infinity
  // The decade of the value and its neighbours cover rounding of log10 and the decade
  // wrap. Their values ascend, so the first one not below `lo` is `above`, and no later
  // one can still be within `hi` (standard values lie more than 1 % apart).
  for (let k = e - 1; k <= e + 1 && above === Infinity; k++) {
    const f = 10 ** Math.abs(k)
    for (const mant of m) {
      const v = k >= 0 ? mant * f : mant / f
      if (v <= hi) below = v
      if (v >= lo) {
        above = v
        break
      }
    }
  }
  return { below, above }
}

/** Nearest standard value by ratio (the log scale the series are spaced on). */
export function nearest(value: number, series: SeriesName): number {
  const { below, above } = bracket(value, series)
  return value / below <= above / value ? below : above
}

/** Smallest standard value not below `value` (a value on the series returns itself). */
export function nearestNotBelow(value: number, series: SeriesName): number {
  return bracket(value, series).above
}

/** Largest standard value not above `value` (a value on the series returns itself). */
export function nearestNotAbove(value: number, series: SeriesName): number {
  return bracket(value, series).below
}
