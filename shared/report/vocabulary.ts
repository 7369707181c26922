/**
 * The words every result is read in, written once: margin states, verdicts, what limits a
 * bit, what a warning code means, and the few number formats that carry a meaning (a
 * capped maximum rate, a divisor, a worst data value). The workspace, the report page, the
 * CSV and the PDF all import them from here (issue 12), so a word changes in one place.
 */
import type { LimitedBy, Warning } from '../types/analysis'
import { formatEng, formatPercent } from '../utils/units'

/** How a margin or a slack reads: healthy (teal), thin (amber), broken (rose), always with a word. */
export type MarginState = 'healthy' | 'thin' | 'broken' | 'unknown'

/**
 * The state of a margin or slack.
 * @param required what the value must reach (below it: thin; below zero: broken)
 * @param thinBelow the team's thin threshold when above the requirement (a guard band)
 */
export function marginState(value: number | null | undefined, required = 0, thinBelow = required): MarginState {
  if (value === null || value === undefined || !Number.isFinite(value)) return 'unknown'
  if (value < 0) return 'broken'
  if (value < Math.max(required, thinBelow)) return 'thin'
  return 'healthy'
}

export const MARGIN_LABEL: Record<MarginState, string> = { healthy: 'healthy', thin: 'thin', broken: 'broken', unknown: 'no data' }

export const VERDICT_STATE: Record<string, MarginState> = { pass: 'healthy', marginal: 'thin', fail: 'broken', incomplete: 'unknown' }
export const VERDICT_LABEL: Record<string, string> = { pass: 'pass', marginal: 'marginal', fail: 'fail', incomplete: 'incomplete' }

/** The term of the budget that limits a bit's margin, in words. */
export const LIMIT_WORDS: Record<LimitedBy, string> = {
  asymmetry: 'edge asymmetry (PWD)',
  clock: 'clock error',
  sampling: 'sampling quantisation',
  jitter: 'jitter',
}
export const limitWords = (code: string): string => LIMIT_WORDS[code as LimitedBy] ?? code

/** A warning code as a short tag beside its message. */
export const WARNING_WORDS: Record<Warning['code'], string> = {
  extrapolation: 'outside the datasheet points',
  'slow-edge': 'slow edge',
  unsaturated: 'not saturated',
  'inverted-polarity': 'inverted',
  'absolute-maximum': 'absolute maximum',
  'single-point-fit': 'one datasheet point',
  'rate-cap': 'search limit',
  'no-pass': 'no margin',
  'generator-error': 'baud generator',
  'threshold-unreachable': 'threshold not reached',
  other: 'note',
}
export const warningWords = (code: string): string => WARNING_WORDS[code as Warning['code']] ?? code

/**
 * Warnings with the same code and message said once, with every place they apply
 * ("telemetry, stage 1; status, stage 1"): a two-direction link no longer repeats each.
 */
export function groupWarnings(warnings: readonly Warning[]): { code: Warning['code']; words: string; message: string; where: string[] }[] {
  const out = new Map<string, { code: Warning['code']; words: string; message: string; where: string[] }>()
  for (const w of warnings) {
    const key = `${w.code}\u0000${w.message}`
    const g = out.get(key) ?? { code: w.code, words: warningWords(w.code), message: w.message, where: [] }
    const place = w.channel ? `${w.channel}${w.stage !== undefined ? `, stage ${w.stage + 1}` : ''}` : null
    if (place && !g.where.includes(place)) g.where.push(place)
    out.set(key, g)
  }
  return [...out.values()]
}

/** The team's thresholds for reading a result (team policy; the link's own requirement when none). */
export interface ReadingThresholds {
  /** UART margin above the requirement a bit needs to read healthy, UI */
  guardBandUi: number
  /** SPI slack below this fraction of the half period reads thin */
  thinSlackFraction: number
}
export const NO_THRESHOLDS: ReadingThresholds = { guardBandUi: 0, thinSlackFraction: 0 }

/** Where a UART margin turns thin: the requirement plus the team's guard band. */
export const uartThinBelow = (requiredUi: number, t: ReadingThresholds = NO_THRESHOLDS) => requiredUi + t.guardBandUi
/** Where an SPI slack turns thin: the requirement, or the team's fraction of the half period when larger. */
export const spiThinBelow = (required: number, halfPeriod: number, t: ReadingThresholds = NO_THRESHOLDS) => Math.max(required, t.thinSlackFraction * halfPeriod)

/** A UART margin's state under the team's thresholds. */
export const uartMarginState = (marginUi: number | null | undefined, requiredUi: number, t?: ReadingThresholds) => marginState(marginUi, requiredUi, uartThinBelow(requiredUi, t))
/** An SPI slack's state under the team's thresholds. */
export const spiSlackState = (slack: number | null | undefined, required: number, halfPeriod: number, t?: ReadingThresholds) => marginState(slack, required, spiThinBelow(required, halfPeriod, t))

/** A worst data value as the firmware engineer writes it: 0x5A. */
export const hexByte = (v: number | null | undefined) => (v === null || v === undefined ? '–' : `0x${v.toString(16).toUpperCase().padStart(2, '0')}`)
/** A baud-generator divisor: integer, or fractional to four places. */
export const divisorText = (d: number | null | undefined) => (d === null || d === undefined ? '–' : String(Number(d.toFixed(4))))
/** A signed rate error: +0.16 %. */
export const rateErrorText = (e: number | null | undefined) => (e === null || e === undefined ? '–' : `${e >= 0 ? '+' : ''}${formatPercent(e)}`)
/** A rate ratio as a signed deviation, 0.957 -> -4.3 %. */
export const toleranceText = (r: number | null) => (r === null ? 'none' : `${r >= 1 ? '+' : ''}${formatPercent(r - 1)}`)

/** The maximum rate as a measured value, or a lower bound when the search stopped at its limit. */
export function maxRateText(max: number | null, capped: boolean, unit: 'Bd' | 'Hz', digits = 3): string {
  if (max === null) return 'none'
  return capped ? `at least ${formatEng(max, unit, { digits })} (search limit)` : formatEng(max, unit, { digits })
}

/** How a protocol is written for people (the trade's spellings). */
export const PROTOCOL_LABEL: Record<'uart' | 'spi' | 'i2c' | 'can' | 'rs485', string> = { uart: 'UART', spi: 'SPI', i2c: 'I2C', can: 'CAN', rs485: 'RS-485' }
