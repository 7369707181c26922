/**
 * The engine as the API uses it. Pure (no Nitro): the seed script imports it too.
 * Engine input errors propagate as EngineInputError and leave as 400 naming the field.
 */
import type { Link } from '../../shared/schemas/link'
import type { LinkSummaryFields } from '../../shared/types/workspace'
import { checkLinkDraft } from '../../shared/schemas/linkDraft'
import { analyzeParsedLink, type LinkAnalysis } from '../timing'
import { ConflictError } from '../utils/errors'

/** The analysis condensed for listings, cached on the link row at save time. */
export function summarize(analysis: LinkAnalysis): LinkSummaryFields {
  return {
    verdict: analysis.verdict,
    worstMarginUi: analysis.uart?.worstMarginUi ?? null,
    worstSlack: analysis.spi?.worstSlack ?? analysis.i2c?.worstSlack ?? analysis.can?.worstSlack ?? (analysis.rs485?.checks.length ? analysis.rs485.worstSlack : null),
    maxBaud: analysis.uart?.maxBaud ?? null,
    maxSclkHz: analysis.spi?.maxSclkHz ?? null,
    maxSclHz: analysis.i2c?.maxSclHz ?? null,
    maxBusLength: analysis.can?.maxBusLength ?? null,
    limitingCheck: analysis.i2c?.limiting ?? analysis.can?.limiting ?? analysis.rs485?.limiting ?? null,
    engineVersion: analysis.engineVersion,
  }
}

/**
 * The saved spec as a complete link, or a 409 naming how many values are still to enter
 * (a draft is saved but never analysed, frozen or exported as a result).
 */
export function requireCompleteSpec(spec: unknown, what: string): Link {
  const check = checkLinkDraft(spec)
  if (check.link) return check.link
  throw new ConflictError(`the link has ${check.missing.length} value${check.missing.length === 1 ? '' : 's'} still to enter; it is ${what} once they are filled in`, {
    missing: check.missing.map((p) => p.join('.')),
  })
}

/** The summary of a link with values still to enter: no verdict from the engine, only the count. */
export function incompleteSummary(missingValues: number): LinkSummaryFields {
  return { verdict: 'incomplete', missingValues, worstMarginUi: null, worstSlack: null, maxBaud: null, maxSclkHz: null, engineVersion: null }
}

/** Analyse a link and summarise it (what a save stores). */
export function analyzeAndSummarize(spec: Link): LinkSummaryFields {
  return summarize(analyzeParsedLink(spec))
}
