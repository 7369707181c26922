import type { StateLevels } from '../../shared/types/capture'
export type { StateLevels }


/** Default bin count: the customary 100 of common state-level routines (common practice). */
export const DEFAULT_BINS = 100

/**
 * State levels by the histogram method of IEEE Std 181 (references.md 5.1): histogram
 * the samples between their min and max into `bins` equal bins, split the range between
 * the lowest and highest non-empty bins into two equal halves, take the mode of each
 * half. Overshoot and preshoot peaks only add a few counts to sparse bins, so they do
 * not move the modes.
 *
 * Refinement (common practice): the mode is a bin, so it only locates a level to one
 * bin width (1 % of the range at 100 bins); the level returned is the mean of the
 * samples in the modal bin and its two neighbours, which is exact for flat levels and
 * unbiased for symmetric noise, without changing which bin was chosen.
 *
 * One pass over the samples (min/max come from the reader). Returns null for a flat
 * channel (no two distinguishable levels).
 */
export function stateLevels(values: ArrayLike<number>, range: { min: number; max: number }, bins = DEFAULT_BINS): StateLevels | null {
  const { min, max } = range
  const n = values.length
  if (n === 0 || !(max > min) || max - min <= 1e-9 * Math.max(1, Math.abs(max), Math.abs(min))) return null
  const count = new Float64Array(bins)
  const sum = new Float64Array(bins)
  const sumSq = new Float64Array(bins)
  const scale = bins / (max - min)
  for (let i = 0; i < n; i++) {
    const v = values[i]!
    let b = Math.floor((v - min) * scale)
    if (b >= bins) b = bins - 1
    else if (b < 0) b = 0
    count[b]!++
    sum[b]! += v
    sumSq[b]! += v * v
  }
  let lo = 0
  while (lo < bins && count[lo] === 0) lo++
  let hi = bins - 1
  while (hi > lo && count[hi] === 0) hi--
  const split = lo + Math.ceil((hi - lo + 1) / 2) // lower half: [lo, split), upper half: [split, hi]
  if (split > hi) return null
  const modeIn = (a: number, b: number) => {
    let m = a
    for (let i = a; i <= b; i++) if (count[i]! > count[m]!) m = i
    return m
  }
  const mLow = modeIn(lo, split - 1)
  const mHigh = modeIn(split, hi)
  const centroid = (m: number, a: number, b: number) => {
    let c = 0
    let s = 0
    for (let i = Math.max(a, m - 1); i <= Math.min(b, m + 1); i++) {
      c += count[i]!
      s += sum[i]!
    }
    return s / c
  }
  const low = centroid(mLow, lo, split - 1)
  const high = centroid(mHigh, split, hi)
  const amplitude = high - low
  if (!(amplitude > 0)) return null
  const spread = (level: number) => {
    const w = Math.max(1, Math.round(0.1 * amplitude * scale))
    const m = Math.min(bins - 1, Math.max(0, Math.floor((level - min) * scale)))
    let c = 0
    let s = 0
    let q = 0
    for (let i = Math.max(0, m - w); i <= Math.min(bins - 1, m + w); i++) {
      c += count[i]!
      s += sum[i]!
      q += sumSq[i]!
    }
    const mean = s / c
    return Math.sqrt(Math.max(0, q / c - mean * mean))
  }
  return {
    low,
    high,
    amplitude,
    ref10: low + 0.1 * amplitude,
    ref50: low + 0.5 * amplitude,
    ref90: low + 0.9 * amplitude,
    noiseLow: spread(low),
    noiseHigh: spread(high),
    bins,
  }
}
