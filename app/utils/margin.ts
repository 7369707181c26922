/**
 * How a margin reads: healthy (teal), thin (amber) or broken (rose), always with a word.
 * The thresholds are the link's own: below zero is broken, below the required margin thin.
 */
export type MarginState = 'healthy' | 'thin' | 'broken' | 'unknown'

/**
 * @param required what the value must reach (below it: thin, below zero: broken)
 * @param thinBelow the team's thin threshold, when above the requirement (a guard band)
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
