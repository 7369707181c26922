/**
 * How a margin looks on screen: the classes of each state. The words and the rules (which
 * state a value is in) are the shared report vocabulary's (shared/report/vocabulary.ts).
 */
import type { MarginState } from '#shared/report/vocabulary'

export { marginState, MARGIN_LABEL, VERDICT_STATE, VERDICT_LABEL, uartMarginState, spiSlackState, limitWords, warningWords, groupWarnings, hexByte, divisorText, rateErrorText, toleranceText, maxRateText } from '#shared/report/vocabulary'
export type { MarginState, ReadingThresholds } from '#shared/report/vocabulary'

/** Tailwind classes of a state's tag (background + text). */
export function stateTagClass(state: MarginState): string {
  return state === 'unknown' ? 'tag-neutral' : `tag-${state}`
}

/** Literal class names per state (Tailwind only generates classes it can read in full). */
export const STATE_TEXT: Record<MarginState, string> = { healthy: 'text-healthy', thin: 'text-thin', broken: 'text-broken', unknown: 'text-ink' }
export const STATE_SVG_WINDOW: Record<MarginState, string> = {
  healthy: 'fill-healthy-soft stroke-healthy',
  thin: 'fill-thin-soft stroke-thin',
  broken: 'fill-broken-soft stroke-broken',
  unknown: 'fill-slate-100 stroke-slate-400',
}
export const STATE_SVG_TEXT: Record<MarginState, string> = { healthy: 'fill-healthy', thin: 'fill-thin', broken: 'fill-broken', unknown: 'fill-slate-500' }
