/**
 * What changed between two links, or two revisions of one link: the inputs field by field
 * (grouped stage by stage and settings), the verdict, and every check's margin (the worst
 * margin or slack, the maximum rate, each bit's margin or each SPI check's slack), biggest
 * change first. Computed from the inputs and the results as they are (a revision's frozen ones),
 * never from a new analysis. Used by the report comparison, the PDF's "changes since"
 * section and `bitslack diff`.
 */
import type { Link } from '../schemas/link'
import type { LinkAnalysis } from '../types/analysis'
import { diffSpecs } from '../utils/specDiff'

export interface MarginChange {
  /** what is compared: "worst margin", "bit d7", "check mosi-setup", "maximum rate" */
  what: string
  unit: 'UI' | 's' | 'Bd' | 'Hz' | 'm'
  a: number | null
  b: number | null
  /** b - a; null when either side has none */
  change: number | null
}

export interface InputChange {
  path: string
  a: unknown
  b: unknown
}

export interface LinkDiff {
  inputs: InputChange[]
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
  if (c.unit === 'Bd' || c.unit === 'Hz' || c.unit === 'm') return Math.abs(c.change) / Math.max(Math.abs(c.a ?? 0), Math.abs(c.b ?? 0), 1)
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
  // the bus links: the worst slack, what the link allows at most, and every check (slack in seconds; a fraction-valued check is left out)
  const busChecks = (r: LinkAnalysis) => (r.i2c?.checks ?? r.can?.checks ?? r.rs485?.checks ?? []).filter((c) => c.unit !== 'fraction')
  if (ra.i2c || rb.i2c || ra.can || rb.can || ra.rs485?.checks.length || rb.rs485?.checks.length) {
    const worst = (r: LinkAnalysis) => r.i2c?.worstSlack ?? r.can?.worstSlack ?? (r.rs485?.checks.length ? r.rs485.worstSlack : null)
    margins.push(change(ra.rs485 || rb.rs485 ? 'turnaround slack' : 'worst slack', 's', worst(ra), worst(rb)))
    if (ra.i2c || rb.i2c) margins.push(change('highest SCL', 'Hz', ra.i2c?.maxSclHz, rb.i2c?.maxSclHz))
    if (ra.can || rb.can) margins.push(change('longest bus', 'm', ra.can?.maxBusLength, rb.can?.maxBusLength))
    const ids = [...new Set([...busChecks(ra), ...busChecks(rb)].map((x) => x.id))]
    for (const id of ids) margins.push(change(`check ${id}`, 's', busChecks(ra).find((x) => x.id === id)?.slack, busChecks(rb).find((x) => x.id === id)?.slack))
  }
  // slack is weighed against a time of the link: SPI's half period, I2C's SCL period, CAN's bit, the UART bit of an RS-485 link
  const timeOf = (r: LinkAnalysis) => r.spi?.halfPeriod ?? (r.i2c ? 1 / r.i2c.sclHz : r.can ? 1 / r.can.bitRate : r.uart?.bitTime)
  const halfPeriod = timeOf(rb) ?? timeOf(ra) ?? 0
  const changed = margins.filter((m) => m.a !== m.b).sort((x, y) => weight(y, halfPeriod) - weight(x, halfPeriod))
  return {
    inputs: diffSpecs(a, b).map((d) => ({ path: d.path, a: d.mine, b: d.theirs })),
    verdict: { a: ra.verdict, b: rb.verdict },
    margins: changed,
  }
}


/** A group of input changes: the settings of the protocol, or one channel's stage or receiver. */
export interface InputGroup {
  /** "UART settings", "channel telemetry: stage 1 (PC817-class coupler)", "channel telemetry: receiver" */
  title: string
  changes: InputChange[]
}

/** The input changes grouped as a reviewer reads a link: settings, then each channel's stages and receiver. */
export function groupInputs(changes: InputChange[], a: Link, b: Link): InputGroup[] {
  const groups = new Map<string, InputGroup>()
  const channelName = (i: number) => b.channels[i]?.id ?? a.channels[i]?.id ?? `#${i + 1}`
  const stageName = (c: number, s: number) => b.channels[c]?.stages[s]?.name ?? a.channels[c]?.stages[s]?.name
  for (const ch of changes) {
    const p = ch.path.split('.')
    let key = p[0]!
    const SETTINGS: Record<string, string> = { uart: 'UART settings', spi: 'SPI settings', i2c: 'I2C settings', can: 'CAN settings', rs485: 'RS-485 settings', channels: 'channels' }
    let title = SETTINGS[key] ?? 'link'
    if (p[0] === 'channels' && p.length > 2) {
      const c = Number(p[1])
      if (p[2] === 'stages' && p.length > 3) {
        const s = Number(p[3])
        key = `channels.${c}.stages.${s}`
        title = `channel ${channelName(c)}: stage ${s + 1}${stageName(c, s) ? ` (${stageName(c, s)})` : ''}`
      } else {
        key = `channels.${c}.${p[2]}`
        title = `channel ${channelName(c)}: ${p[2]}`
      }
    }
    if (!groups.has(key)) groups.set(key, { title, changes: [] })
    groups.get(key)!.changes.push(ch)
  }
  return [...groups.values()]
}
