/**
 * What `bitslack check` does with a link, apart from the command line itself: read the link
 * JSON, apply the overrides, check it against the shared schema, and put the engine's answer
 * in a few lines (the verdict, the worst bit or check, the maximum rate). Pure but for reading
 * the file; the engine is the server's own (server/timing), so the answer is the app's.
 */
import { readFileSync } from 'node:fs'
import { checkLinkDraft } from '../shared/schemas/linkDraft'
import type { Link } from '../shared/schemas/link'
import type { LinkAnalysis, Verdict } from '../shared/types/analysis'
import { limitWords, maxRateText, warningWords } from '../shared/report/vocabulary'
import { formatEng, formatUi } from '../shared/utils/units'

/** Input the check cannot use (exit code 2): a missing file, bad JSON, a field the schema refuses. */
export class CliInputError extends Error {}

export const EXIT = { pass: 0, fail: 1, badInput: 2 } as const

/** The link JSON in a file: a link as exported (`/links/N/link.json`, a report's link.json) or a saved link's `spec`. */
export function readLinkFile(file: string): unknown {
  let text: string
  try {
    text = readFileSync(file, 'utf8')
  } catch (err) {
    throw new CliInputError(`cannot read ${file}: ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`)
  }
  let json: unknown
  try {
    json = JSON.parse(text)
  } catch (err) {
    throw new CliInputError(`${file} is not JSON: ${(err as Error).message}`)
  }
  // a link as the API returns it carries its definition in `spec`
  if (json && typeof json === 'object' && 'spec' in json && !('protocol' in json)) return (json as { spec: unknown }).spec
  return json
}

export interface Overrides {
  baud?: number
  requiredMargin?: number
  sclk?: number
}

/** The link with the command line's overrides in place (the firmware's rate, the margin a CI step asks for). */
export function applyOverrides(raw: unknown, o: Overrides): unknown {
  if (o.baud === undefined && o.requiredMargin === undefined && o.sclk === undefined) return raw
  if (!raw || typeof raw !== 'object') throw new CliInputError('the file does not hold a link object')
  const link = structuredClone(raw) as { protocol?: string; uart?: Record<string, unknown>; spi?: Record<string, unknown> }
  if (o.baud !== undefined || o.requiredMargin !== undefined) {
    if (link.protocol !== 'uart' || !link.uart) throw new CliInputError(`--baud and --required-margin apply to UART links; this link is ${link.protocol ?? 'of no protocol'}`)
    if (o.baud !== undefined) link.uart.baud = o.baud
    if (o.requiredMargin !== undefined) link.uart.requiredMarginUi = o.requiredMargin
  }
  if (o.sclk !== undefined) {
    if (link.protocol !== 'spi' || !link.spi) throw new CliInputError(`--sclk applies to SPI links; this link is ${link.protocol ?? 'of no protocol'}`)
    link.spi.sclkHz = o.sclk
  }
  return link
}

/** The link as the engine takes it, or a CliInputError naming every field to fix or fill in. */
export function parseForCheck(raw: unknown, source: string): Link {
  const check = checkLinkDraft(raw)
  if (check.link) return check.link
  const lines = [
    ...check.issues.map((i) => `  ${i.path.join('.') || '(link)'}: ${i.message}`),
    ...check.missing.map((p) => `  ${p.join('.')}: enter a value`),
  ]
  throw new CliInputError(`${source} is not a complete link:\n${lines.join('\n')}`)
}

/** The few numbers a CI step reports, in the units of the trade. */
export interface CheckSummary {
  name: string
  protocol: Link['protocol']
  verdict: Verdict
  engineVersion: string
  uart?: {
    baud: number
    requiredMarginUi: number
    worstMarginUi: number | null
    worstBit: string | null
    worstSide: 'early' | 'late' | null
    limitedBy: string | null
    maxBaud: number | null
    maxBaudCapped: boolean
    maxBaudSetBy: string | null
    noMarginReason: string | null
  }
  spi?: {
    sclkHz: number
    worstSlack: number | null
    worstCheck: string | null
    maxSclkHz: number | null
    limitingCheck: string | null
    noSlackReason: string | null
  }
  /** I2C, CAN and RS-485: the limiting check of the bus and the highest rate it allows */
  bus?: {
    what: string
    worstCheck: string | null
    worstSlack: number
    failing: string[]
    maxRate: string | null
  }
  warnings: string[]
}

export function summariseForCheck(a: LinkAnalysis): CheckSummary {
  const out: CheckSummary = {
    name: a.input.name,
    protocol: a.input.protocol,
    verdict: a.verdict,
    engineVersion: a.engineVersion,
    warnings: a.warnings.map((w) => `${warningWords(w.code)}: ${w.message}`),
  }
  if (a.uart) {
    const u = a.uart
    const worst = u.worstBit === null ? undefined : u.bits.find((b) => b.index === u.worstBit)
    out.uart = {
      baud: u.baud,
      requiredMarginUi: u.requiredMarginUi,
      worstMarginUi: u.worstMarginUi,
      worstBit: worst?.label ?? null,
      worstSide: worst?.side ?? null,
      limitedBy: worst ? limitWords(worst.limitedBy) : null,
      maxBaud: u.maxBaud,
      maxBaudCapped: u.maxBaudCapped,
      maxBaudSetBy: u.maxBaudLimitedBy ? `${u.maxBaudLimitedBy.label}, ${u.maxBaudLimitedBy.side} side` : null,
      noMarginReason: u.noMarginReason,
    }
  }
  if (a.spi) {
    const s = a.spi
    out.spi = { sclkHz: s.sclkHz, worstSlack: s.worstSlack, worstCheck: s.worstCheck, maxSclkHz: s.maxSclkHz, limitingCheck: s.limitingCheck, noSlackReason: s.noSlackReason }
  }
  const failing = (cs: { id: string; pass: boolean }[]) => cs.filter((c) => !c.pass).map((c) => c.id)
  if (a.i2c) {
    const i = a.i2c
    out.bus = { what: `I2C ${i.mode} at ${formatEng(i.sclHz, 'Hz')}`, worstCheck: i.limiting, worstSlack: i.worstSlack, failing: [...failing(i.checks), ...failing(i.levelChecks)], maxRate: i.maxSclHz === null ? null : `SCL ${formatEng(i.maxSclHz, 'Hz')} (set by ${i.maxSclLimitedBy})` }
  }
  if (a.can) {
    const c = a.can
    out.bus = { what: `CAN at ${formatEng(c.bitRate, 'bit/s')}${c.fd ? `, data phase ${formatEng(c.fd.dataBitRate, 'bit/s')}` : ''}`, worstCheck: c.limiting, worstSlack: c.worstSlack, failing: failing(c.checks), maxRate: c.maxBusLength === null ? null : `bus up to ${c.maxBusLength.toFixed(0)} m at this bit rate` }
  }
  if (a.rs485 && a.rs485.checks.length) {
    const r = a.rs485
    out.bus = { what: `RS-485 ${r.duplex} duplex turnaround`, worstCheck: r.limiting, worstSlack: r.worstSlack, failing: failing(r.checks), maxRate: r.minLeadTime === null ? null : `DE lead at least ${formatEng(r.minLeadTime, 's')}, lag at least ${formatEng(r.minLagTime ?? 0, 's')}` }
  }
  return out
}

/** The summary as lines for a build log. */
export function checkText(s: CheckSummary): string {
  const lines: string[] = []
  if (s.uart) {
    const u = s.uart
    lines.push(`${s.name}: UART at ${formatEng(u.baud, 'Bd', { digits: 7 })}`)
    lines.push(`verdict: ${s.verdict.toUpperCase()}`)
    if (u.worstMarginUi === null) lines.push(`worst bit: no margin (${u.noMarginReason ?? 'the link cannot carry data'})`)
    else lines.push(`worst bit: ${u.worstBit}, margin ${formatUi(u.worstMarginUi)} (required ${formatUi(u.requiredMarginUi)}), ${u.worstSide} side, limited by ${u.limitedBy}`)
    lines.push(`maximum rate: ${maxRateText(u.maxBaud, u.maxBaudCapped, 'Bd')}${u.maxBaudSetBy ? ` (set by ${u.maxBaudSetBy})` : ''}`)
  }
  if (s.spi) {
    const p = s.spi
    lines.push(`${s.name}: SPI at ${formatEng(p.sclkHz, 'Hz')}`)
    lines.push(`verdict: ${s.verdict.toUpperCase()}`)
    if (p.worstSlack === null) lines.push(`worst check: no slack (${p.noSlackReason ?? 'the link cannot carry data'})`)
    else lines.push(`worst check: ${p.worstCheck}, slack ${formatEng(p.worstSlack, 's')} beyond its requirement`)
    lines.push(`maximum SCLK: ${maxRateText(p.maxSclkHz, false, 'Hz')}${p.limitingCheck ? ` (set by ${p.limitingCheck})` : ''}`)
  }
  if (s.bus) {
    const b = s.bus
    if (!s.uart) lines.push(`${s.name}: ${b.what}`, `verdict: ${s.verdict.toUpperCase()}`)
    else lines.push(`${b.what}`)
    lines.push(`limiting check: ${b.worstCheck ?? 'none'}, slack ${formatEng(b.worstSlack, 's')}${b.failing.length ? `; failing: ${b.failing.join(', ')}` : ''}`)
    if (b.maxRate) lines.push(`most the link allows: ${b.maxRate}`)
  }
  for (const w of s.warnings) lines.push(`warning: ${w}`)
  lines.push(`engine ${s.engineVersion}; timing only: insulation, creepage, clearance and safety approvals follow the applicable standards, and every link still needs bench verification`)
  return lines.join('\n')
}

/**
 * Only a pass exits 0. A marginal link samples inside the bit but closer to its edge than the
 * required margin (the engine's verdict: 0 <= worst margin < required), so it has lost the margin
 * a CI step guards, and exits 1 like a failing one.
 */
export function exitCodeOf(verdict: Verdict): number {
  return verdict === 'pass' ? EXIT.pass : EXIT.fail
}
