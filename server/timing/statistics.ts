/**
 * Statistics for the statistical views (timing-model.md sections 2 and 7): the
 * Gaussian tail and its inverse, the dual-Dirac total jitter, a seeded random number
 * generator, quantiles and histograms.
 *
 * Conventions: Q(BER) = Phi^-1(1 - BER) (Phi the standard normal CDF, transition
 * density 0.5 folded into BER as the common dual-Dirac tables do), and
 * TJ(BER) = DJ(dual-Dirac, peak to peak) + 2 Q(BER) RJ(rms).
 */

const SQRT2 = Math.SQRT2
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI)

/**
 * Complementary error function erfc(x), full double precision.
 * |x| < 2.5: erf by its series of positive terms, erf(x) = 2/sqrt(pi) e^(-x^2)
 * sum 2^n x^(2n+1) / (1*3*...*(2n+1)); larger x: the continued fraction
 * erfc(x) = e^(-x^2)/sqrt(pi) * 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + ...)))), evaluated
 * by the modified Lentz method.
 */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN
  if (x < 0) return 2 - erfc(-x)
  if (x < 2.5) {
    const x2 = x * x
    let term = x
    let sum = x
    for (let n = 1; n < 200; n++) {
      term *= (2 * x2) / (2 * n + 1)
      sum += term
      if (term < sum * 1e-17) break
    }
    return 1 - 2 * INV_SQRT_PI * Math.exp(-x2) * sum
  }
  if (x > 27) return 0
  // Lentz on b0 + a1/(b1 + a2/(b2 + ...)) with b = x, a_k = k/2
  const tiny = 1e-300
  let f = x
  let c = x
  let d = 0
  for (let k = 1; k < 500; k++) {
    const a = k / 2
    d = x + a * d
    d = Math.abs(d) < tiny ? tiny : d
    c = x + a / c
    c = Math.abs(c) < tiny ? tiny : c
    d = 1 / d
    const delta = c * d
    f *= delta
    if (Math.abs(delta - 1) < 1e-16) break
  }
  return (INV_SQRT_PI * Math.exp(-x * x)) / f
}

/** Standard normal CDF Phi(x). */
export function normalCdf(x: number): number {
  return 0.5 * erfc(-x / SQRT2)
}

/** Gaussian upper tail 1 - Phi(x) = P(Z > x), without cancellation for large x. */
export function gaussianTail(x: number): number {
  return 0.5 * erfc(x / SQRT2)
}

/** Standard normal density. */
function normalPdf(x: number): number {
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI)
}

/**
 * Inverse standard normal CDF Phi^-1(p), 0 < p < 1: a rational first guess (relative
 * error about 1e-9) refined by two Halley steps against `erfc`, so the result is
 * accurate to about 1e-15.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError('normalQuantile needs 0 < p < 1')
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239]
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1]
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783]
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416]
  const pLow = 0.02425
  let x: number
  if (p < pLow) {
    const q = Math.sqrt(-2 * Math.log(p))
    x = (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1)
  } else if (p <= 1 - pLow) {
    const q = p - 0.5
    const r = q * q
    x = ((((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q) / (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1)
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p))
    x = -(((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1)
  }
  for (let i = 0; i < 2; i++) {
    // residual in the tail that keeps precision: upper tail for x > 0
    const e = x > 0 ? 1 - p - gaussianTail(x) : normalCdf(x) - p
    const u = (x > 0 ? -e : e) / normalPdf(x)
    x = x - u / (1 + (x * u) / 2)
  }
  return x
}

/** Q(BER) = Phi^-1(1 - BER): the dual-Dirac multiplier (half of the 2Q column of the usual BER tables). */
export function qFromBer(ber: number): number {
  if (!(ber > 0 && ber < 0.5)) throw new RangeError('BER must be in (0, 0.5)')
  // Phi^-1(1 - BER) = -Phi^-1(BER): use the small argument directly (no 1 - 1e-12 rounding)
  return -normalQuantile(ber)
}

/** Dual-Dirac total jitter TJ = DJ + 2 Q(BER) RJ, seconds (DJ peak to peak, RJ rms). */
export function totalJitter(dj: number, rj: number, ber: number): number {
  return dj + 2 * qFromBer(ber) * rj
}

/** Root-sum-square of the arguments. */
export function rss(values: readonly number[]): number {
  let s = 0
  for (const v of values) s += v * v
  return Math.sqrt(s)
}

/**
 * Seeded pseudo-random generator (sfc32 with a splitmix32 seed expansion): the same seed
 * gives the same sequence on every platform, so a spread study reproduces exactly.
 */
export interface Rng {
  /** uniform in [0, 1) */
  next(): number
  /** standard normal (ziggurat) */
  normal(): number
}

/** Ziggurat tables for the standard normal (Marsaglia and Tsang, 128 strips). */
const ZIG_R = 3.442619855899
const ZIG_K = new Float64Array(128)
const ZIG_W = new Float64Array(128)
const ZIG_F = new Float64Array(128)
;(() => {
  const m1 = 2147483648
  const vn = 9.91256303526217e-3
  let dn = ZIG_R
  let tn = dn
  const q = vn / Math.exp(-0.5 * dn * dn)
  ZIG_K[0] = Math.floor((dn / q) * m1)
  ZIG_K[1] = 0
  ZIG_W[0] = q / m1
  ZIG_W[127] = dn / m1
  ZIG_F[0] = 1
  ZIG_F[127] = Math.exp(-0.5 * dn * dn)
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * Math.log(vn / dn + Math.exp(-0.5 * dn * dn)))
    ZIG_K[i + 1] = Math.floor((dn / tn) * m1)
    tn = dn
    ZIG_F[i] = Math.exp(-0.5 * dn * dn)
    ZIG_W[i] = dn / m1
  }
})()

export function createRng(seed: number): Rng {
  // int32 arithmetic throughout (| 0) keeps every value a small integer for the JIT
  let s = seed | 0
  const split = () => {
    s = (s + 0x9e3779b9) | 0
    let z = s
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b)
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35)
    return (z ^ (z >>> 16)) | 0
  }
  let a = split()
  let b = split()
  let c = split()
  let d = split()
  // sfc32 step, int32 output
  const nextInt = () => {
    const t = (((a + b) | 0) + d) | 0
    d = (d + 1) | 0
    a = b ^ (b >>> 9)
    b = (c + (c << 3)) | 0
    c = (c << 21) | (c >>> 11)
    c = (c + t) | 0
    return t
  }
  const next = () => (nextInt() >>> 0) / 4294967296
  for (let i = 0; i < 12; i++) next()
  /** uniform in (0, 1), never 0 (for logarithms) */
  const open = () => ((nextInt() >>> 0) + 0.5) / 4294967296
  /**
   * Standard normal by the ziggurat method of Marsaglia and Tsang (2000), 128 strips:
   * one integer draw and one multiply for about 98 % of the draws.
   */
  const normal = () => {
    let hz = nextInt()
    let iz = hz & 127
    if (Math.abs(hz) < ZIG_K[iz]!) return hz * ZIG_W[iz]!
    for (;;) {
      let x = hz * ZIG_W[iz]!
      if (iz === 0) {
        // the tail beyond r
        let y: number
        do {
          x = -Math.log(open()) / ZIG_R
          y = -Math.log(open())
        } while (y + y < x * x)
        return hz > 0 ? ZIG_R + x : -ZIG_R - x
      }
      if (ZIG_F[iz]! + open() * (ZIG_F[iz - 1]! - ZIG_F[iz]!) < Math.exp(-0.5 * x * x)) return x
      hz = nextInt()
      iz = hz & 127
      if (Math.abs(hz) < ZIG_K[iz]!) return hz * ZIG_W[iz]!
    }
  }
  return { next, normal }
}

/** Quantile p (0..1) of ascending-sorted values, linear interpolation between order statistics. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length
  if (n === 0) throw new RangeError('quantile of no values')
  const h = (n - 1) * Math.min(1, Math.max(0, p))
  const lo = Math.floor(h)
  const hi = Math.min(n - 1, lo + 1)
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!)
}


/** Equal-width histogram of `values` over [min, max] in `bins` bins. */
export function histogram(values: ArrayLike<number>, bins: number, min?: number, max?: number): HistogramBin[] {
  const n = values.length
  let lo = min ?? Infinity
  let hi = max ?? -Infinity
  if (min === undefined || max === undefined)
    for (let i = 0; i < n; i++) {
      const v = values[i]!
      if (min === undefined && v < lo) lo = v
      if (max === undefined && v > hi) hi = v
    }
  if (n === 0 || !Number.isFinite(lo) || !Number.isFinite(hi)) return []
  if (hi <= lo) return [{ lo, hi: lo, count: n }]
  const width = (hi - lo) / bins
  const counts = new Array<number>(bins).fill(0)
  for (let i = 0; i < n; i++) {
    const v = values[i]!
    if (v < lo || v > hi) continue
    const k = Math.min(bins - 1, Math.floor((v - lo) / width))
    counts[k]!++
  }
  return counts.map((count, k) => ({ lo: lo + k * width, hi: k === bins - 1 ? hi : lo + (k + 1) * width, count }))
}

import type { HistogramBin } from '../../shared/types/analysis'
export type { HistogramBin }