/**
 * The engine as the API uses it. Pure (no Nitro): the seed script imports it too.
 * Engine input errors propagate as EngineInputError and leave as 400 naming the field.
 */
import type { Link } from '../../shared/schemas/link'
import type { LinkSummaryFields } from '../../shared/types/workspace'
import { analyzeLink, type LinkAnalysis } from '../timing'

/** The analysis condensed for listings, cached on the link row at save time. */
export function summarize(analysis: LinkAnalysis): LinkSummaryFields {
  return {
    verdict: analysis.verdict,
    worstMarginUi: analysis.uart?.worstMarginUi ?? null,
    worstSlack: analysis.spi?.worstSlack ?? null,
    maxBaud: analysis.uart?.maxBaud ?? null,
    maxSclkHz: analysis.spi?.maxSclkHz ?? null,
    engineVersion: analysis.engineVersion,
  }
}

/** Analyse a link and summarise it (what a save stores). */
export function analyzeAndSummarize(spec: Link): LinkSummaryFields {
  return summarize(analyzeLink(spec))
}
