/**
 * CSV exports of a revision's tables (RFC 4180: comma separated, CRLF line ends, quotes
 * doubled). The columns are the shared report tables' (shared/report/tables.ts), so the CSV
 * says what the screen and the PDF say; values are plain SI numbers and codes as the engine
 * computed them, so a spreadsheet can recompute with them; each header names its unit.
 */
import { toCsv } from '../../shared/utils/csv'
import { REPORT_TABLES, type ReportTable } from '../../shared/schemas/report'
import type { LinkAnalysis, PullupSweepResult } from '../../shared/types/analysis'
import type { ReadingThresholds } from '../../shared/report/vocabulary'
import {
  bitColumns,
  columnsFor,
  pullupColumns,
  spiCandidateColumns,
  spiCheckColumns,
  busCheckColumns,
  i2cLevelColumns,
  i2cPullupColumns,
  canTimingColumns,
  canLengthColumns,
  stageColumns,
  standardRateColumns,
  type ReportColumn,
} from '../../shared/report/tables'

/** Tables a revision can export. */
export { REPORT_TABLES, type ReportTable }

/** Which tables exist for this result (UART: bits, rates; SPI: checks, candidates). */
export function availableTables(a: LinkAnalysis, hasPullup: boolean): ReportTable[] {
  const t: ReportTable[] = []
  if (a.uart) t.push('bits', 'standard-rates', 'rate-sweep')
  if (a.spi) t.push('checks', 'candidates')
  if (a.i2c || a.can || a.rs485?.checks.length) t.push('bus-checks')
  if (a.i2c) t.push('i2c-levels', 'i2c-pullups')
  if (a.can) t.push('can-bit-timing', 'can-bus-length')
  t.push('stages')
  if (hasPullup) t.push('pullup')
  return t
}

/** Rows of a shared table as CSV, each row led by the values of `lead` (e.g. its channel). */
function tableCsv<R>(columns: ReportColumn<R>[], groups: { lead: (string | number)[]; rows: R[] }[], leadHeaders: string[] = []): string {
  const cols = columnsFor(columns, 'csv')
  return toCsv(
    [...leadHeaders, ...cols.map((c) => c.csvLabel ?? c.label)],
    groups.flatMap((g) => g.rows.map((r) => [...g.lead, ...cols.map((c) => c.value(r))])),
  )
}

/** One table of the result as CSV; null when the result has no such table. */
export function reportTableCsv(a: LinkAnalysis, table: ReportTable, pullup: PullupSweepResult | null = null, t?: ReadingThresholds): string | null {
  const uart = a.uart
  const spi = a.spi
  switch (table) {
    case 'bits':
      if (!uart) return null
      return tableCsv(
        bitColumns(uart.requiredMarginUi, t),
        uart.byChannel.map((ch) => ({ lead: [ch.channelId], rows: ch.bits })),
        ['channel'],
      )
    case 'standard-rates':
      if (!uart) return null
      return tableCsv(
        standardRateColumns(uart.requiredMarginUi, null, { tx: '', rx: '' }, t),
        uart.byChannel.map((ch) => ({ lead: [ch.channelId], rows: ch.standardRates })),
        ['channel'],
      )
    case 'rate-sweep':
      if (!uart) return null
      return toCsv(['channel', 'baud (Bd)', 'worst margin (UI)'], uart.byChannel.flatMap((ch) => ch.rateSweep.map((p) => [ch.channelId, p.baud, p.marginUi])))
    case 'checks':
      if (!spi) return null
      return tableCsv(spiCheckColumns(spi.halfPeriod, t), [{ lead: [], rows: spi.checks }])
    case 'candidates':
      if (!spi) return null
      return tableCsv(spiCandidateColumns(), [{ lead: [], rows: spi.candidates }])
    case 'bus-checks': {
      const checks = a.i2c?.checks ?? a.can?.checks ?? a.rs485?.checks
      if (!checks?.length) return null
      return tableCsv(busCheckColumns(), [{ lead: [], rows: checks }])
    }
    case 'i2c-levels':
      if (!a.i2c) return null
      return tableCsv(i2cLevelColumns(), [{ lead: [], rows: a.i2c.levelChecks }])
    case 'i2c-pullups':
      if (!a.i2c) return null
      return tableCsv(i2cPullupColumns(), a.i2c.pullupSweep.map((sw) => ({ lead: [sw.side, sw.series], rows: sw.rows })), ['side', 'series'])
    case 'can-bit-timing':
      if (!a.can) return null
      return tableCsv(canTimingColumns(), [{ lead: [], rows: a.can.bitTimings }])
    case 'can-bus-length':
      if (!a.can) return null
      return tableCsv(canLengthColumns(), [{ lead: [], rows: a.can.lengthByRate }])
    case 'stages':
      return tableCsv(
        stageColumns(),
        a.channels.map((ch) => ({ lead: [ch.id], rows: ch.stages })),
        ['channel'],
      )
    case 'pullup':
      if (!pullup) return null
      return tableCsv(pullupColumns(pullup.requiredMarginUi, { rbe: pullup.rbeValues.length > 0, t }), [{ lead: [], rows: pullup.rows }])
  }
}

