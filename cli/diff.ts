/**
 * `bitslack diff A.json B.json`: what changed between two links, in their inputs (every field
 * that differs, by path) and in their margins (the verdict, the worst margin or slack, the
 * maximum rate, and every bit's margin or every SPI check's slack), biggest change first.
 */
import type { Link } from '../shared/schemas/link'
import type { LinkAnalysis } from '../shared/types/analysis'
import { diffSpecs } from '../shared/utils/specDiff'
import { formatEng, formatUi } from '../shared/utils/units'

export interface MarginChange {
  /** what is compared: "worst margin", "bit d7", "check mosi-setup", "maximum rate" */
  what: string
  unit: 'UI' | 's' | 'Bd' | 'Hz'
  a: number | null
  b: number | null
  /** b - a; null when either side has none */
  change: number | null
}

export interface LinkDiff {
  inputs: { path: string; a: unknown; b: unknown }[]
  verdict: { a: string; b: string }
  margins: MarginChange[]
}

const change = (what: string, unit: MarginChange['unit'], a: number | null | undefined, b: number | null | undefined): MarginChange => ({
  what,
  unit,
  a: a ?? null,
  b: b ?? null,
  change: a === null || a === undefined || b === null || b === undefined ? null : b - a,
})

/** The size of a change for ordering: relative for rates, absolute UI for margins, slack against the half period. */
function weight(c: MarginChange, halfPeriod: number): number {
  if (c.change === null) return c.a === c.b ? 0 : Number.POSITIVE_INFINITY
  if (c.unit === 'Bd' || c.unit === 'Hz') return Math.abs(c.change) / Math.max(Math.abs(c.a ?? 0), Math.abs(c.b ?? 0), 1)
  if (c.unit === 's') return Math.abs(c.change) / (halfPeriod || 1)
  return Math.abs(c.change)
}

export function diffLinks(a: Link, b: Link, ra: LinkAnalysis, rb: LinkAnalysis): LinkDiff {
  const margins: MarginChange[] = []
  if (ra.uart || rb.uart) {
    margins.push(change('worst margin', 'UI', ra.uart?.worstMarginUi, rb.uart?.worstMarginUi))
    margins.push(change('maximum rate', 'Bd', ra.uart?.maxBaud, rb.uart?.maxBaud))
    const labels = [...new Set([...(ra.uart?.bits ?? []), ...(rb.uart?.bits ?? [])].map((x) => x.label))]
    for (const label of labels)
      margins.push(change(`bit ${label}`, 'UI', ra.uart?.bits.find((x) => x.label === label)?.marginUi, rb.uart?.bits.find((x) => x.label === label)?.marginUi))
  }
  if (ra.spi || rb.spi) {
    margins.push(change('worst slack', 's', ra.spi?.worstSlack, rb.spi?.worstSlack))
    margins.push(change('maximum SCLK', 'Hz', ra.spi?.maxSclkHz, rb.spi?.maxSclkHz))
    const ids = [...new Set([...(ra.spi?.checks ?? []), ...(rb.spi?.checks ?? [])].map((x) => x.id))]
    for (const id of ids) margins.push(change(`check ${id}`, 's', ra.spi?.checks.find((x) => x.id === id)?.slack, rb.spi?.checks.find((x) => x.id === id)?.slack))
  }
  const halfPeriod = rb.spi?.halfPeriod ?? ra.spi?.halfPeriod ?? 0
  const changed = margins.filter((m) => m.a !== m.b).sort((x, y) => weight(y, halfPeriod) - weight(x, halfPeriod))
  return {
    inputs: diffSpecs(a, b).map((d) => ({ path: d.path, a: d.mine, b: d.theirs })),
    verdict: { a: ra.verdict, b: rb.verdict },
    margins: changed,
  }
}

const show = (v: unknown) => (v === undefined ? '(none)' : typeof v === 'string' ? v : JSON.stringify(v))

function value(v: number | null, unit: MarginChange['unit']): string {
  if (v === null) return 'none'
  return unit === 'UI' ? formatUi(v) : formatEng(v, unit)
}

export function diffText(d: LinkDiff, nameA: string, nameB: string): string {
  const lines = [`A: ${nameA}`, `B: ${nameB}`, '', `verdict: ${d.verdict.a} -> ${d.verdict.b}`, '']
  lines.push(d.inputs.length ? `inputs (${d.inputs.length} changed):` : 'inputs: no field differs')
  for (const i of d.inputs) lines.push(`  ${i.path}: ${show(i.a)} -> ${show(i.b)}`)
  lines.push('')
  lines.push(d.margins.length ? 'margins (biggest change first):' : 'margins: none changed')
  for (const m of d.margins) {
    const delta = m.change === null ? '' : `  (${m.unit === 'UI' ? formatUi(m.change) : `${m.change >= 0 ? '+' : ''}${formatEng(m.change, m.unit)}`})`
    lines.push(`  ${m.what}: ${value(m.a, m.unit)} -> ${value(m.b, m.unit)}${delta}`)
  }
  return lines.join('\n')
}
