/**
 * One set of numbers everywhere (issue 12): on each demo link, the bit timeline, the
 * screen's tables, the CSV and the PDF show the engine's own numbers through the shared
 * report vocabulary. The screen's columns and the PDF's are the same column specs; the CSV
 * carries the raw values; the timeline places the engine's windows and margins.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { ADC_SPI_LINK, DEBUG_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { buildReportPdf, REPORT_FONT_FILES, type ReportFonts } from '../../../../server/reports/pdf'
import { reportTableCsv } from '../../../../server/reports/csv'
import { bitColumns, cellText, columnsFor, spiCheckColumns, stageColumns, standardRateColumns, splitStandardRates } from '../../../../shared/report/tables'
import { levelsOf, uartTimelineGeometry } from '../../../../app/utils/chart/timeline'
import { parseCsv } from '../../../support/csv'
import { buildReportDetail } from '../../../factories/reports'

const fonts = Object.fromEntries(Object.entries(REPORT_FONT_FILES).map(([k, f]) => [k, readFileSync(path.resolve('server/assets/fonts', f))])) as unknown as ReportFonts
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-consistency-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

async function pdfText(name: string, report: ReturnType<typeof buildReportDetail>) {
  const file = path.join(dir, `${name}.pdf`)
  writeFileSync(file, await buildReportPdf(report, fonts))
  // one line per text line, spaces collapsed: cells of one table row sit on one line
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/[ \t]+/g, ' ')
}

describe.each([
  ['telemetry', TELEMETRY_LINK],
  ['debug', DEBUG_LINK],
])('UART demo link %s', (name, link) => {
  const report = buildReportDetail(link)
  const a = report.result
  const t = report.thresholds ?? undefined

  it('the per-bit table: PDF rows read as the screen reads them, the CSV holds the engine values', async () => {
    const text = await pdfText(name, report)
    for (const ch of a.uart!.byChannel) {
      const cols = columnsFor(bitColumns(ch.requiredMarginUi, t), 'pdf')
      // the screen shows the same cells (its columns are a superset: the '#' column)
      const screen = columnsFor(bitColumns(ch.requiredMarginUi, t), 'screen')
      expect(cols.every((c) => screen.some((x) => x.key === c.key))).toBe(true)
      for (const b of ch.bits) {
        const row = cols.map((c) => cellText(c, b)).join(' ')
        expect(text, `${ch.channelId} ${b.label}`).toContain(row)
      }
      const csv = parseCsv(reportTableCsv(a, 'bits', null, t)!)
      const header = csv[0]!
      const mine = csv.slice(1).filter((r) => r[0] === ch.channelId)
      expect(mine).toHaveLength(ch.bits.length)
      mine.forEach((r, i) => {
        const b = ch.bits[i]!
        expect(Number(r[header.indexOf('margin (UI)')])).toBe(b.marginUi)
        expect(Number(r[header.indexOf('early margin (s)')])).toBe(b.earlyMargin)
        expect(r[header.indexOf('label')]).toBe(b.label)
      })
    }
  })

  it('the standard rates: the rows the PDF prints are the screen cells; the CSV lists every rate', async () => {
    const text = await pdfText(`${name}-rates`, report)
    const u = a.uart!
    const ends = { tx: '', rx: '' }
    const cols = columnsFor(standardRateColumns(u.requiredMarginUi, u.fastestStandardRate, ends, t), 'pdf')
    for (const r of splitStandardRates(u.standardRates, u.maxBaud).shown) expect(text).toContain(cols.map((c) => cellText(c, r)).join(' '))
    const csv = parseCsv(reportTableCsv(a, 'standard-rates', null, t)!)
    expect(csv.length - 1).toBe(u.byChannel.reduce((n, ch) => n + ch.standardRates.length, 0))
  })

  it('the stages: each stage row of the PDF is the screen row; the CSV carries the corners', async () => {
    const text = await pdfText(`${name}-stages`, report)
    const cols = columnsFor(stageColumns(), 'pdf')
    const csv = parseCsv(reportTableCsv(a, 'stages')!)
    for (const ch of a.channels)
      for (const st of ch.stages) {
        // the name may wrap in its column: compare the numeric cells
        expect(text).toContain(cols.filter((c) => c.numeric && c.key !== 'index').map((c) => cellText(c, st)).join(' '))
        const row = csv.find((r) => r[0] === ch.id && Number(r[1]) === st.index + 1)!
        expect(Number(row[csv[0]!.indexOf('tPLH max (s)')])).toBe(st.tplh.max)
      }
  })

  it('the bit timeline places the same windows and margins, synchronised on the start edge', () => {
    for (const ch of a.uart!.byChannel) {
      const tl = ch.timeline!
      const g = uartTimelineGeometry({
        bitTime: ch.bitTime,
        frameBits: ch.frame.frameBits,
        levels: levelsOf(tl.levels[ch.bits[ch.worstBit ?? 0]?.worstPattern ?? 0]!, tl.cells.length),
        backToBack: ch.frame.backToBack,
        lanes: tl.lanes.map((l) => ({ name: l.kind, inverted: l.inverted, edges: l.edges })),
        sync: tl.sync,
        bits: ch.bits,
        requiredUi: ch.requiredMarginUi,
        thresholds: t,
        width: 1200,
      })
      expect(g.windows.map((w) => w.marginUi)).toEqual(ch.bits.map((b) => b.marginUi))
      expect(g.windows.map((w) => w.label)).toEqual(ch.bits.map((b) => b.label))
      expect(tl.cells.slice(0, ch.bits.length)).toEqual(ch.bits.map((b) => b.label))
    }
  })
})

describe('SPI demo link', () => {
  const report = buildReportDetail(ADC_SPI_LINK)
  const spi = report.result.spi!
  it('the SPI checks: PDF rows are the screen cells, the CSV holds each slack', async () => {
    const text = await pdfText('spi', report)
    const cols = columnsFor(spiCheckColumns(spi.halfPeriod, report.thresholds ?? undefined), 'pdf')
    for (const c of spi.checks) expect(text).toContain(cols.filter((x) => x.key !== 'description').map((x) => cellText(x, c)).join(' '))
    const csv = parseCsv(reportTableCsv(report.result, 'checks', null, report.thresholds ?? undefined)!)
    for (const c of spi.checks) expect(Number(csv.find((r) => r[0] === c.id)![csv[0]!.indexOf('slack (s)')])).toBe(c.slack)
  })
})
