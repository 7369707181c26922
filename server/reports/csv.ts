/**
 * CSV exports of a revision's tables (RFC 4180: comma separated, CRLF line ends, quotes
 * doubled). Values are plain SI numbers as the engine computed them, so a spreadsheet can
 * recompute with them; each header names its unit.
 */
import { toCsv } from '../../shared/utils/csv'
import type { LinkAnalysis } from '../timing/analyze'

/** Tables a revision can export. */
export const REPORT_TABLES = ['bits', 'checks', 'standard-rates', 'rate-sweep', 'stages', 'pullup'] as const
export type ReportTable = (typeof REPORT_TABLES)[number]

/** Which tables exist for this result (UART: bits, rates; SPI: checks). */
export function availableTables(a: LinkAnalysis, hasPullup: boolean): ReportTable[] {
  const t: ReportTable[] = []
  if (a.uart) t.push('bits', 'standard-rates', 'rate-sweep')
  if (a.spi) t.push('checks')
  t.push('stages')
  if (hasPullup) t.push('pullup')
  return t
}

type PullupRows = { rows: { rl: number; rLed: number | null; ledCurrent: number | null; ic: number; power: number; marginUi: number | null; maxBaud: number | null; withinRatings: boolean; meetsTarget: boolean; feasible: boolean; reasons: string[] }[] } | null

/** One table of the result as CSV; null when the result has no such table. */
export function reportTableCsv(a: LinkAnalysis, table: ReportTable, pullup: PullupRows = null): string | null {
  switch (table) {
    case 'bits':
      if (!a.uart) return null
      return toCsv(
        ['channel', 'bit', 'label', 'early margin (s)', 'late margin (s)', 'margin (s)', 'margin (UI)', 'side', 'limited by', 'worst data value', 'valid from (s)', 'valid to (s)', 'earliest sample (s)', 'latest sample (s)'],
        a.uart.byChannel.flatMap((ch) =>
          ch.bits.map((b) => [ch.channelId, b.index, b.label, b.earlyMargin, b.lateMargin, b.margin, b.marginUi, b.side, b.limitedBy, b.worstPattern, b.validFrom, b.validTo, b.samples.earliest, b.samples.latest]),
        ),
      )
    case 'standard-rates':
      if (!a.uart) return null
      return toCsv(
        ['channel', 'baud (Bd)', 'margin (UI)', 'pass', 'divisor', 'rate error (fraction)'],
        a.uart.byChannel.flatMap((ch) => ch.standardRates.map((r) => [ch.channelId, r.baud, r.marginUi, r.pass, r.divisor, r.error])),
      )
    case 'rate-sweep':
      if (!a.uart) return null
      return toCsv(['channel', 'baud (Bd)', 'worst margin (UI)'], a.uart.byChannel.flatMap((ch) => ch.rateSweep.map((p) => [ch.channelId, p.baud, p.marginUi])))
    case 'checks':
      if (!a.spi) return null
      return toCsv(
        ['check', 'slack (s)', 'slack (fraction of half period)', 'required (s)', 'pass', 'description'],
        a.spi.checks.map((c) => [c.id, c.slack, c.slackFraction, c.required, c.pass, c.description]),
      )
    case 'stages':
      return toCsv(
        ['channel', 'stage', 'name', 'kind', 'inverting', 'tPLH min (s)', 'tPLH typ (s)', 'tPLH max (s)', 'tPHL min (s)', 'tPHL typ (s)', 'tPHL max (s)', 'tr max (s)', 'tf max (s)', 'asymmetry min (s)', 'asymmetry max (s)'],
        a.channels.flatMap((ch) =>
          ch.stages.map((s) => [ch.id, s.index + 1, s.name, s.kind, s.inverting, s.tplh.min, s.tplh.typ, s.tplh.max, s.tphl.min, s.tphl.typ, s.tphl.max, s.tr.max, s.tf.max, s.asymmetry.min, s.asymmetry.max]),
        ),
      )
    case 'pullup':
      if (!pullup) return null
      return toCsv(
        ['RL (ohm)', 'LED resistor (ohm)', 'LED current (A)', 'collector current (A)', 'power (W)', 'margin (UI)', 'max baud (Bd)', 'within ratings', 'meets target', 'feasible', 'reasons'],
        pullup.rows.map((r) => [r.rl, r.rLed, r.ledCurrent, r.ic, r.power, r.marginUi, r.maxBaud, r.withinRatings, r.meetsTarget, r.feasible, r.reasons.join('; ')]),
      )
  }
}
