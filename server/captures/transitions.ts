import type { StateLevels } from './levels'
import type { Polarity, Edge } from '../../shared/types/capture'
export type { Polarity, Edge }



export interface EdgeSearch {
  edges: Edge[]
  /** volts: a rising transition is recognised above `upper` after having been below `lower`, and the other way round */
  lower: number
  upper: number
  /** half-width of the hysteresis band as a fraction of the amplitude */
  hysteresis: number
}

/**
 * Hysteresis half-width (fraction of the amplitude): at least 0.2 (thresholds at 30 % and
 * 70 %), widened to 4 rms noise so that noise riding on a state level cannot cross the
 * band, at most 0.4 (common practice).
 */
export function defaultHysteresis(levels: StateLevels): number {
  const noise = Math.max(levels.noiseLow, levels.noiseHigh)
  return Math.min(0.4, Math.max(0.2, (4 * noise) / levels.amplitude))
}

/**
 * Every transition of one channel (timing-model.md section 6, references.md 5.1).
 * A transition is recognised when the signal, having been at or below the lower
 * hysteresis threshold, reaches the upper one (rising), or the other way round; noise
 * inside the band never makes an edge. For each transition, the 50 % instant is the last
 * crossing of the 50 % level before the recognition point, the 10 % (90 %) instant the
 * last crossing of that level before it and the 90 % (10 %) instant the first crossing
 * after it; all three are linearly interpolated between the straddling samples.
 */
export function findEdges(time: ArrayLike<number>, y: ArrayLike<number>, levels: StateLevels, hysteresis = defaultHysteresis(levels)): EdgeSearch {
  const n = y.length
  const { ref10, ref50, ref90, amplitude, low } = levels
  const lower = low + (0.5 - hysteresis) * amplitude
  const upper = low + (0.5 + hysteresis) * amplitude
  const edges: Edge[] = []
  const cross = (j: number, ref: number) => {
    const y0 = y[j]!
    const y1 = y[j + 1]!
    const t0 = time[j]!
    return y1 === y0 ? t0 : t0 + ((ref - y0) * (time[j + 1]! - t0)) / (y1 - y0)
  }
  let state = 0 // -1 low, +1 high, 0 not yet known
  let lastBelow = -1
  let lastAbove = -1
  let bound = 0 // back searches stop at the previous transition's 50 % sample
  for (let i = 0; i < n; i++) {
    const v = y[i]!
    if (v <= lower) {
      if (state === 1) {
        // falling: the last 50 % crossing after the signal was last high
        let k = i - 1
        while (k > lastAbove && !(y[k]! > ref50 && y[k + 1]! <= ref50)) k--
        if (k < lastAbove) k = lastAbove
        const t50 = cross(k, ref50)
        let j = k
        while (j >= bound && !(y[j]! >= ref90)) j--
        const t90 = j >= bound && j + 1 < n ? cross(j, ref90) : null
        let f = k + 1
        while (f < n && y[f]! > ref10 && y[f]! < upper) f++
        const t10 = f < n && y[f]! <= ref10 ? cross(f - 1, ref10) : null
        edges.push({ polarity: 'falling', t50, t10, t90, duration: t10 !== null && t90 !== null ? t10 - t90 : null })
        bound = k
      }
      state = -1
      lastBelow = i
    } else if (v >= upper) {
      if (state === -1) {
        let k = i - 1
        while (k > lastBelow && !(y[k]! < ref50 && y[k + 1]! >= ref50)) k--
        if (k < lastBelow) k = lastBelow
        const t50 = cross(k, ref50)
        let j = k
        while (j >= bound && !(y[j]! <= ref10)) j--
        const t10 = j >= bound && j + 1 < n ? cross(j, ref10) : null
        let f = k + 1
        while (f < n && y[f]! < ref90 && y[f]! > lower) f++
        const t90 = f < n && y[f]! >= ref90 ? cross(f - 1, ref90) : null
        edges.push({ polarity: 'rising', t50, t10, t90, duration: t10 !== null && t90 !== null ? t90 - t10 : null })
        bound = k
      }
      state = 1
      lastAbove = i
    }
  }
  return { edges, lower, upper, hysteresis }
}
