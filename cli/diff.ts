/**
 * `bitslack diff A.json B.json`: what changed between two links, in their inputs (every field
 * that differs, by path) and in their margins (the verdict, the worst margin or slack, the
 * maximum rate, and every bit's margin or every SPI check's slack), biggest change first.
 */
import { type LinkDiff, type MarginChange } from '../shared/report/compare'
import { formatEng, formatUi } from '../shared/utils/units'

export { diffLinks } from '../shared/report/compare'

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
