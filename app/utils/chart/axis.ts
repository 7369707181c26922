/**
 * Axes for the plots: d3-scale does the maths, Vue draws the ticks. Every function
 * returns plain numbers and strings.
 */
import { scaleLinear, scaleLog } from 'd3-scale'
import { formatEng } from '../../../shared/utils/units'

export interface Tick {
  value: number
  /** pixel position along the axis */
  pos: number
  label: string
}

/** Ticks of a linear axis, labelled in engineering notation with the unit. */
export function linearTicks(domain: [number, number], range: [number, number], count = 6, unit = '', digits = 3): Tick[] {
  const s = scaleLinear().domain(domain).range(range)
  return s.ticks(count).map((v) => ({ value: v, pos: s(v), label: formatEng(Math.abs(v) < 1e-15 * Math.abs(domain[1] - domain[0]) ? 0 : v, unit, { digits }) }))
}

/** Ticks of a logarithmic axis (1-2-5 per decade when they fit), labelled with the unit. */
export function logTicks(domain: [number, number], range: [number, number], count = 6, unit = ''): Tick[] {
  const s = scaleLog().domain(domain).range(range)
  let ticks = s.ticks(count)
  if (ticks.length > count * 2) ticks = ticks.filter((v) => [1, 2, 5].includes(Math.round(v / 10 ** Math.floor(Math.log10(v) + 1e-9))))
  if (ticks.length > count * 2) ticks = ticks.filter((v) => Math.abs(Math.log10(v) - Math.round(Math.log10(v))) < 1e-9)
  return ticks.map((v) => ({ value: v, pos: s(v), label: formatEng(v, unit, { digits: 2 }) }))
}

/** [min, max] of values, padded by a fraction of the span (or around a single value); finite values only. */
export function extent(values: (number | null | undefined)[], pad = 0.05, include: number[] = []): [number, number] {
  const v = [...values, ...include].filter((x): x is number => typeof x === 'number' && Number.isFinite(x))
  if (!v.length) return [0, 1]
  let lo = Math.min(...v)
  let hi = Math.max(...v)
  if (lo === hi) {
    const d = Math.abs(lo) * 0.1 || 1
    lo -= d
    hi += d
  }
  const p = (hi - lo) * pad
  return [lo - p, hi + p]
}

/**
 * A label in at most two lines of about `width` characters, broken between words; a longer
 * one ends with an ellipsis (its full text goes in the element's title).
 */
export function wrapLabel(text: string, width = 20): string[] {
  if (text.length <= width) return [text]
  const words = text.split(' ')
  let first = ''
  while (words.length && (first ? `${first} ${words[0]}` : words[0]!).length <= width) first = first ? `${first} ${words.shift()}` : words.shift()!
  if (!first) first = words.shift()!.slice(0, width - 1) + '…'
  const rest = words.join(' ')
  return rest ? [first, rest.length > width ? `${rest.slice(0, width - 1)}…` : rest] : [first]
}
