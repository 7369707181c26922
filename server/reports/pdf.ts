/**
 * The margin report as a PDF (issue 6), drawn with pdfkit: text in Inter, numbers in
 * JetBrains Mono (both shipped with the app, server/assets/fonts), the bit timeline, the
 * rate sweep and every table as vector graphics. Pure: it takes the revision DTO (whose
 * `result` is the engine's frozen analysis) and the font files, and returns the bytes, so
 * the route and the tests build the very same document.
 *
 * The fonts' latin subsets have no Greek or math signs: units are written "ohm" and "us"
 * (pdfText), never with the Greek letters.
 */
import PDFDocument from 'pdfkit'
import { REPORT_STATE_LABEL } from '../../shared/schemas/report'
import type { ReportDetailDto } from '../../shared/types/report'
import { formatEng, formatPercent, formatUi } from '../../shared/utils/units'
import type { SummaryStats } from '../captures/stats'
import type { UartChannelResult } from '../timing/uart'
import { SAFETY_CAUTION } from '../../shared/utils/caution'

export interface ReportFonts {
  /** Inter 400, latin subset, .woff */
  text: Buffer
  /** Inter 600 */
  textBold: Buffer
  /** JetBrains Mono 400 */
  mono: Buffer
  /** JetBrains Mono 700 */
  monoBold: Buffer
}

export type PaperSize = 'A4' | 'LETTER'

/** File names of the fonts inside server/assets/fonts. */
export const REPORT_FONT_FILES: Record<keyof ReportFonts, string> = {
  text: 'inter-latin-400-normal.woff',
  textBold: 'inter-latin-600-normal.woff',
  mono: 'jetbrains-mono-latin-400-normal.woff',
  monoBold: 'jetbrains-mono-latin-700-normal.woff',
}

/** Characters outside the latin subsets, spelled in plain letters. */
export function pdfText(s: string): string {
  return s
    .replace(/µ/g, 'u')
    .replace(/[Ω\u2126]/g, 'ohm')
    .replace(/≤/g, '<=')
    .replace(/≥/g, '>=')
    .replace(/±/g, '+-')
    .replace(/τ/g, 'tau')
    .replace(/σ/g, 'sigma')
    .replace(/→/g, '->')
    .replace(/…/g, '...')
}

const eng = (v: number | null | undefined, unit: string, digits = 3) => pdfText(formatEng(v, unit, { digits }))

// colours: teal healthy, amber thin, rose broken (always with a word beside them)
const INK = '#1f2933'
const MUTED = '#52606d'
const RULE = '#cbd2d9'
const HEALTHY = '#0f766e'
const THIN = '#b45309'
const BROKEN = '#be123c'
const SOFT = '#f1f5f9'

function stateColour(value: number, required: number) {
  return value < 0 ? BROKEN : value < required ? THIN : HEALTHY
}
function stateWord(value: number, required: number) {
  return value < 0 ? 'broken' : value < required ? 'thin' : 'healthy'
}
const VERDICT_COLOUR: Record<string, string> = { pass: HEALTHY, marginal: THIN, fail: BROKEN }

const LIMIT_WORDS: Record<string, string> = {
  asymmetry: 'edge asymmetry (PWD)',
  clock: 'clock error',
  sampling: 'sampling quantisation',
  jitter: 'jitter',
}

interface Column {
  label: string
  width: number
  align?: 'left' | 'right'
  mono?: boolean
}

type Doc = InstanceType<typeof PDFDocument>
// fontkit takes a feature map; the typings only know the array form
const MONO_FEATURES = { liga: false, calt: false } as unknown as PDFKit.Mixins.OpenTypeFeatures[]

/** Build the PDF of one revision. */
export async function buildReportPdf(report: ReportDetailDto, fonts: ReportFonts, paper: PaperSize = 'A4'): Promise<Buffer> {
  const doc: Doc = new PDFDocument({
    size: paper,
    margins: { top: 56, bottom: 56, left: 50, right: 50 },
    bufferPages: true,
    info: {
      Title: pdfText(`Margin report ${report.label}: ${report.linkName}`),
      Author: pdfText(report.author?.name ?? 'Bitslack'),
      Subject: 'Timing budget of an isolated serial link',
      Creator: 'Bitslack',
      Producer: 'Bitslack',
      CreationDate: new Date(report.createdAt),
    },
  })
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })

  doc.registerFont('Text', fonts.text)
  doc.registerFont('TextBold', fonts.textBold)
  doc.registerFont('Mono', fonts.mono)
  doc.registerFont('MonoBold', fonts.monoBold)

  const left = doc.page.margins.left
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right
  const bottom = () => doc.page.height - doc.page.margins.bottom

  const ensure = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage()
  }
  const text = (s: string, opts: PDFKit.Mixins.TextOptions & { size?: number; bold?: boolean; colour?: string } = {}) => {
    const { size = 9, bold = false, colour = INK, ...rest } = opts
    doc.font(bold ? 'TextBold' : 'Text').fontSize(size).fillColor(colour).text(pdfText(s), rest)
  }
  const mono = (s: string, x: number, y: number, opts: PDFKit.Mixins.TextOptions & { size?: number; bold?: boolean; colour?: string } = {}) => {
    const { size = 8, bold = false, colour = INK, ...rest } = opts
    doc.font(bold ? 'MonoBold' : 'Mono').fontSize(size).fillColor(colour).text(pdfText(s), x, y, { ...rest, features: MONO_FEATURES, lineBreak: false })
  }
  const heading = (s: string, newPage = false) => {
    if (newPage) doc.addPage()
    else {
      ensure(60)
      doc.moveDown(0.8)
    }
    doc.x = left
    text(s, { size: 12.5, bold: true })
    const y = doc.y + 2
    doc.moveTo(left, y).lineTo(left + width, y).lineWidth(0.5).strokeColor(RULE).stroke()
    doc.y = y + 6
  }
  const keyValues = (rows: [string, string][], keyWidth = 130) => {
    for (const [k, v] of rows) {
      ensure(14)
      const y = doc.y
      doc.font('Text').fontSize(8.5).fillColor(MUTED).text(pdfText(k), left, y, { width: keyWidth })
      const hk = doc.y - y
      doc.font('Mono').fontSize(8.5).fillColor(INK).text(pdfText(v), left + keyWidth, y, { width: width - keyWidth, features: MONO_FEATURES })
      doc.y = Math.max(doc.y, y + hk) + 2
    }
    doc.x = left
  }
  /** A table with a repeated header on each page; `rowColour` tints a cell by column. */
  const table = (columns: Column[], rows: string[][], opts: { rowColour?: (r: number, c: number) => string | undefined; caption?: string } = {}) => {
    const rowH = 13
    const total = columns.reduce((s, c) => s + c.width, 0)
    const scale = width / total
    const cols = columns.map((c) => ({ ...c, width: c.width * scale }))
    const drawHeader = () => {
      const y = doc.y
      doc.rect(left, y, width, rowH + 2).fill(SOFT)
      let x = left
      for (const c of cols) {
        doc.font('TextBold').fontSize(7.5).fillColor(MUTED).text(pdfText(c.label), x + 3, y + 3.5, { width: c.width - 6, height: rowH - 3, align: c.align ?? 'left', ellipsis: true })
        x += c.width
      }
      doc.y = y + rowH + 2
    }
    if (opts.caption) {
      ensure(rowH * 3)
      text(opts.caption, { size: 8, colour: MUTED })
      doc.moveDown(0.2)
    }
    ensure(rowH * 3)
    drawHeader()
    /** A cell wraps within its column; the row is as tall as its tallest cell. */
    const cellHeight = (cell: string, col: (typeof cols)[number]) => {
      if (col.mono === false) doc.font('Text').fontSize(7.5)
      else doc.font('Mono').fontSize(7.5)
      return doc.heightOfString(pdfText(cell), { width: col.width - 6, ...(col.mono === false ? {} : { features: MONO_FEATURES }) })
    }
    rows.forEach((row, r) => {
      const h = Math.max(rowH, ...row.map((cell, c) => cellHeight(cell, cols[c]!) + 5))
      if (doc.y + h > bottom()) {
        doc.addPage()
        drawHeader()
      }
      const y = doc.y
      let x = left
      row.forEach((cell, c) => {
        const col = cols[c]!
        const colour = opts.rowColour?.(r, c) ?? INK
        if (col.mono === false) doc.font('Text').fontSize(7.5).fillColor(colour).text(pdfText(cell), x + 3, y + 3, { width: col.width - 6, align: col.align ?? 'left' })
        else doc.font('Mono').fontSize(7.5).fillColor(colour).text(pdfText(cell), x + 3, y + 3, { width: col.width - 6, align: col.align ?? 'right', features: MONO_FEATURES })
        x += col.width
      })
      doc.moveTo(left, y + h).lineTo(left + width, y + h).lineWidth(0.3).strokeColor(RULE).stroke()
      doc.y = y + h
    })
    doc.x = left
    doc.moveDown(0.4)
  }
  const bullets = (items: string[], colour = INK) => {
    for (const item of items) {
      ensure(14)
      const y = doc.y
      doc.font('Text').fontSize(8).fillColor(MUTED).text('-', left, y, { width: 8 })
      doc.font('Text').fontSize(8).fillColor(colour).text(pdfText(item), left + 10, y, { width: width - 10 })
      doc.moveDown(0.15)
    }
    doc.x = left
  }

  const a = report.result
  const uart = a.uart
  const spi = a.spi
  const when = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : '-')

  // ------------------------------------------------------------ title and summary
  text('Bitslack margin report', { size: 9, colour: MUTED })
  text(`${report.linkName}`, { size: 18, bold: true })
  text(`${report.projectName} · revision ${report.label} · ${REPORT_STATE_LABEL[report.state]}`, { size: 10, colour: MUTED })
  doc.moveDown(0.6)
  keyValues([
    ['Frozen', `${when(report.createdAt)} by ${report.author?.name ?? '(former member)'}`],
    ['Link version', String(report.linkVersion)],
    ['Engine version', report.engineVersion],
    ['Protocol', report.protocol.toUpperCase()],
  ])

  heading('Summary')
  {
    const y = doc.y
    const colour = VERDICT_COLOUR[a.verdict] ?? INK
    doc.roundedRect(left, y, 92, 26, 3).fill(colour)
    doc.font('TextBold').fontSize(13).fillColor('#ffffff').text(a.verdict.toUpperCase(), left, y + 6, { width: 92, align: 'center' })
    doc.y = y
    doc.x = left
    const rows: [string, string][] = []
    if (uart) {
      const wb = uart.worstBit === null ? undefined : uart.bits[uart.worstBit]
      rows.push([
        'Worst margin',
        uart.worstMarginUi === null
          ? `none: ${uart.noMarginReason}`
          : `${formatUi(uart.worstMarginUi)} (${eng(wb?.margin, 's')}), required ${formatUi(uart.requiredMarginUi)}: ${stateWord(uart.worstMarginUi, uart.requiredMarginUi)}`,
      ])
      rows.push(['Maximum baud', `${eng(uart.maxBaud, 'Bd', 4)} (configured ${eng(uart.baud, 'Bd', 4)})`])
      if (wb) rows.push(['Limited by', `bit ${wb.label}, ${wb.side} side: ${LIMIT_WORDS[wb.limitedBy] ?? wb.limitedBy}`])
      rows.push(['Note', uart.maxBaudNote])
    }
    if (spi) {
      const wc = spi.checks.find((c) => c.id === spi.worstCheck)
      rows.push([
        'Worst slack',
        spi.worstSlack === null ? `none: ${spi.noSlackReason}` : `${eng(spi.worstSlack, 's')} (${spi.worstCheck}), required ${eng(wc?.required ?? 0, 's')}: ${stateWord(spi.worstSlack, wc?.required ?? 0)}`,
      ])
      rows.push(['Maximum SCLK', `${eng(spi.maxSclkHz, 'Hz', 4)} (configured ${eng(spi.sclkHz, 'Hz', 4)}, mode ${spi.mode})`])
      rows.push(['Limited by', spi.limitingCheck ? `${spi.limitingCheck}: ${spi.checks.find((c) => c.id === spi.limitingCheck)?.description ?? ''}` : 'no check up to the SCLK limit'])
      rows.push(['Round trip', `${eng(spi.roundTrip.min, 's')} to ${eng(spi.roundTrip.max, 's')}`])
    }
    const saveLeft = doc.page.margins.left
    doc.page.margins.left = left + 104
    for (const [k, v] of rows) {
      const yy = doc.y
      doc.font('Text').fontSize(8.5).fillColor(MUTED).text(pdfText(k), left + 104, yy, { width: 80 })
      doc.font('Mono').fontSize(8.5).fillColor(INK).text(pdfText(v), left + 186, yy, { width: width - 186, features: MONO_FEATURES })
      doc.y += 2
    }
    doc.page.margins.left = saveLeft
    doc.x = left
  }
  doc.moveDown(0.8)
  {
    ensure(50)
    const y = doc.y
    doc.font('Text').fontSize(8)
    const h = doc.heightOfString(pdfText(SAFETY_CAUTION), { width: width - 16 }) + 12
    doc.rect(left, y, width, h).lineWidth(0.8).strokeColor(THIN).fillAndStroke('#fffbeb', THIN)
    doc.font('TextBold').fontSize(8).fillColor(INK).text('Safety caution. ', left + 8, y + 6, { width: width - 16, continued: true })
    doc.font('Text').text(pdfText(SAFETY_CAUTION))
    doc.y = y + h + 4
    doc.x = left
  }

  // ------------------------------------------------------------ stages and settings
  heading('Stages and settings')
  for (const ch of a.channels) {
    const spec = report.input.channels.find((c) => c.id === ch.id)
    text(`Channel ${ch.id} (${ch.role})${spec?.label ? `: ${spec.label}` : ''}`, { size: 9.5, bold: true })
    doc.moveDown(0.2)
    table(
      [
        { label: '#', width: 18 },
        { label: 'Stage', width: 150, mono: false, align: 'left' },
        { label: 'Kind', width: 70, mono: false, align: 'left' },
        { label: 'tPLH typ/max', width: 80 },
        { label: 'tPHL typ/max', width: 80 },
        { label: 'tr / tf max', width: 80 },
        { label: 'Asymmetry max', width: 62 },
      ],
      ch.stages.map((s) => [
        String(s.index + 1),
        s.name,
        s.kind + (s.inverting ? ', inverting' : ''),
        `${eng(s.tplh.typ, 's')} / ${eng(s.tplh.max, 's')}`,
        `${eng(s.tphl.typ, 's')} / ${eng(s.tphl.max, 's')}`,
        `${eng(s.tr.max, 's')} / ${eng(s.tf.max, 's')}`,
        eng(s.asymmetry.max, 's'),
      ]),
    )
    const rx = spec?.receiver
    keyValues([
      ['Chain delay rise', `${eng(ch.rise.min, 's')} / ${eng(ch.rise.typ, 's')} / ${eng(ch.rise.max, 's')} (min / typ / max)`],
      ['Chain delay fall', `${eng(ch.fall.min, 's')} / ${eng(ch.fall.typ, 's')} / ${eng(ch.fall.max, 's')}`],
      ['PWD (rise - fall)', `${eng(ch.pwd.min, 's')} to ${eng(ch.pwd.max, 's')}, typ ${eng(ch.pwdTyp, 's')}`],
      ['Received tr / tf', `${eng(ch.tr.max, 's')} / ${eng(ch.tf.max, 's')} max`],
      ['Polarity', `${ch.polarity}${ch.functional ? '' : ' (the channel cannot carry data as set)'}`],
      ...(rx
        ? ([['Receiver', `VDD ${eng(rx.vdd, 'V')}, VIL ${eng(rx.vil, 'V')}, VIH ${eng(rx.vih, 'V')}${rx.schmitt ? ', Schmitt' : ''}${rx.invert ? ', inverted' : ''}`]] as [string, string][])
        : []),
    ])
    doc.moveDown(0.5)
  }
  if (report.input.uart) {
    const u = report.input.uart
    text('UART settings', { size: 9.5, bold: true })
    doc.moveDown(0.2)
    const clock = (c: { errorPpm?: number; clockHz?: number; tolerancePpm?: number; fractionBits?: number }) =>
      c.clockHz !== undefined ? `generator ${eng(c.clockHz, 'Hz', 4)}${c.fractionBits ? `, ${c.fractionBits} fraction bits` : ''}${c.tolerancePpm !== undefined ? `, +-${c.tolerancePpm} ppm` : ''}` : `+-${c.errorPpm} ppm`
    keyValues([
      ['Baud', eng(u.baud, 'Bd', 4)],
      ['Frame', `${u.dataBits} data, parity ${u.parity}, ${u.stopBits} stop${u.backToBack ? ', back to back' : ''}`],
      ['Required margin', formatUi(u.requiredMarginUi)],
      ['Transmitter clock', clock(u.tx)],
      ['Receiver clock', clock(u.rx)],
      ['Receiver sampler', `${u.rx.sampler}, ${u.rx.oversampling}x, vote ${u.rx.vote}${u.rx.sampleTicks ? `, ticks ${u.rx.sampleTicks.join(' ')}` : ''}`],
    ])
  }
  if (report.input.spi) {
    const s = report.input.spi
    text('SPI settings', { size: 9.5, bold: true })
    doc.moveDown(0.2)
    keyValues([
      ['SCLK', `${eng(s.sclkHz, 'Hz', 4)}, CPOL ${s.cpol}, CPHA ${s.cpha}`],
      ['Required slack', eng(s.requiredSlack, 's')],
      ['Controller MISO', `setup ${eng(s.controller.misoSetup, 's')}, hold ${eng(s.controller.misoHold, 's')}${s.controller.delayedSampling ? ', delayed sampling' : ''}`],
      ['Peripheral', `MOSI setup ${eng(s.peripheral.mosiSetup, 's')}, hold ${eng(s.peripheral.mosiHold, 's')}, clock to out ${eng(s.peripheral.clockToOut.min, 's')} to ${eng(s.peripheral.clockToOut.max, 's')}`],
      ...s.packages.map((p, i) => [`Package ${i + 1}`, `${p.channels.join(', ')}: channel skew ${eng(p.channelSkew, 's')}`] as [string, string]),
    ])
  }

  // ------------------------------------------------------------ per-bit or per-check table and timeline
  if (uart) {
    for (const ch of uart.byChannel) {
      heading(`Per-bit margins: ${ch.channelId}`, true)
      text(`At ${eng(ch.baud, 'Bd', 4)}, bit time ${eng(ch.bitTime, 's')}; margins are the worst over every data value.`, { size: 8, colour: MUTED })
      doc.moveDown(0.3)
      table(
        [
          { label: 'Bit', width: 34 },
          { label: 'Early margin', width: 70 },
          { label: 'Late margin', width: 70 },
          { label: 'Margin (UI)', width: 64 },
          { label: 'State', width: 52, mono: false, align: 'left' },
          { label: 'Side', width: 36, mono: false, align: 'left' },
          { label: 'Limited by', width: 110, mono: false, align: 'left' },
          { label: 'Worst value', width: 56 },
        ],
        ch.bits.map((b) => [
          b.label,
          eng(b.earlyMargin, 's'),
          b.lateMargin === null ? 'no end' : eng(b.lateMargin, 's'),
          formatUi(b.marginUi),
          stateWord(b.marginUi, ch.requiredMarginUi),
          b.side,
          LIMIT_WORDS[b.limitedBy] ?? b.limitedBy,
          `0x${b.worstPattern.toString(16).toUpperCase().padStart(2, '0')}`,
        ]),
        { rowColour: (r, c) => (c === 3 || c === 4 ? stateColour(ch.bits[r]!.marginUi, ch.requiredMarginUi) : undefined) },
      )
      ensure(200)
      text('Bit timeline', { size: 9.5, bold: true })
      drawTimeline(doc, ch, left, doc.y + 4, width)
      doc.x = left
    }
  }
  if (spi) {
    heading('SPI checks', true)
    text(`At ${eng(spi.sclkHz, 'Hz', 4)}, half period ${eng(spi.halfPeriod, 's')}.`, { size: 8, colour: MUTED })
    doc.moveDown(0.3)
    table(
      [
        { label: 'Check', width: 70, mono: false, align: 'left' },
        { label: 'Slack', width: 64 },
        { label: 'Fraction', width: 56 },
        { label: 'Required', width: 60 },
        { label: 'State', width: 52, mono: false, align: 'left' },
        { label: 'What is compared', width: 230, mono: false, align: 'left' },
      ],
      spi.checks.map((c) => [c.id, eng(c.slack, 's'), formatPercent(c.slackFraction), eng(c.required, 's'), stateWord(c.slack, c.required), c.description]),
      { rowColour: (r, c) => (c === 1 || c === 4 ? stateColour(spi.checks[r]!.slack, spi.checks[r]!.required) : undefined) },
    )
    ensure(150)
    text('Slack per check', { size: 9.5, bold: true })
    drawSlackBars(doc, spi.checks, left, doc.y + 4, width)
    doc.x = left
    heading('SCLK candidates')
    table(
      [
        { label: 'SCLK', width: 80 },
        { label: 'Prescaler', width: 60 },
        { label: 'Worst slack', width: 80 },
        { label: 'Worst check', width: 90, mono: false, align: 'left' },
        { label: 'Pass', width: 40, mono: false, align: 'left' },
      ],
      spi.candidates.map((c) => [eng(c.sclkHz, 'Hz', 4), c.prescaler === null ? '-' : String(c.prescaler), eng(c.worstSlack, 's'), c.worstCheck, c.pass ? 'pass' : 'fail']),
      { rowColour: (r, c) => (c === 2 || c === 4 ? (spi.candidates[r]!.pass ? HEALTHY : BROKEN) : undefined) },
    )
  }

  // ------------------------------------------------------------ rate sweep, standard rates
  if (uart) {
    heading('Rate sweep', true)
    text(`Worst margin of ${uart.channelId} against baud (logarithmic); the dashed line is the required margin, the marker the configured rate.`, { size: 8, colour: MUTED })
    drawRateSweep(doc, uart, left, doc.y + 6, width, 190)
    doc.x = left
    doc.moveDown(0.6)
    table(
      [
        { label: 'Standard rate', width: 80 },
        { label: 'Margin (UI)', width: 70 },
        { label: 'State', width: 60, mono: false, align: 'left' },
        { label: 'Divisor', width: 60 },
        { label: 'Rate error', width: 70 },
      ],
      uart.standardRates.map((r) => [eng(r.baud, 'Bd', 4), formatUi(r.marginUi), r.pass ? 'pass' : 'fail', r.divisor === null ? '-' : String(r.divisor), r.error === null ? '-' : formatPercent(r.error)]),
      { caption: 'Standard rates', rowColour: (r, c) => (c === 1 || c === 2 ? (uart.standardRates[r]!.pass ? HEALTHY : BROKEN) : undefined) },
    )
  }

  // ------------------------------------------------------------ pull-up choice
  if (report.pullup) {
    const p = report.pullup
    heading('Pull-up choice')
    const rec = p.sweep.recommended !== null ? p.sweep.rows[p.sweep.recommended] : null
    keyValues([
      ['Stage', `channel ${p.sweep.channelId}, stage ${p.sweep.stageIndex + 1}`],
      ['In this revision', `RL ${eng(p.rl, 'ohm')}, LED resistor ${p.rLed === null ? 'from the LED current' : eng(p.rLed, 'ohm')}`],
      ['Recommended', rec ? `RL ${eng(rec.rl, 'ohm')}, LED resistor ${eng(rec.rLed, 'ohm')}, max ${eng(rec.maxBaud, 'Bd', 4)}` : 'no row meets the target within the ratings'],
      ['Sweep', `${p.sweep.series}, target ${eng(p.sweep.targetBaud, 'Bd', 4)}, overdrive ${p.sweep.overdrive}`],
    ])
    const rows = p.sweep.rows
    const picked = new Set<number>([...(p.chosenRow !== null ? [p.chosenRow] : []), ...(p.sweep.recommended !== null ? [p.sweep.recommended] : []), ...p.sweep.alternatives.slice(0, 3)])
    const shown = rows.map((r, i) => ({ r, i })).filter(({ i }) => picked.has(i) || rows.length <= 16)
    table(
      [
        { label: 'RL', width: 60 },
        { label: 'LED resistor', width: 70 },
        { label: 'LED current', width: 66 },
        { label: 'Margin (UI)', width: 64 },
        { label: 'Max baud', width: 70 },
        { label: 'Ratings', width: 56, mono: false, align: 'left' },
        { label: 'Row', width: 90, mono: false, align: 'left' },
      ],
      shown.map(({ r, i }) => [
        eng(r.rl, 'ohm'),
        eng(r.rLed, 'ohm'),
        eng(r.ledCurrent, 'A'),
        formatUi(r.marginUi),
        eng(r.maxBaud, 'Bd', 4),
        r.withinRatings ? 'within' : 'exceeded',
        [i === p.chosenRow ? 'this revision' : '', i === p.sweep.recommended ? 'recommended' : '', r.fasterAlternative ? 'faster' : ''].filter(Boolean).join(', '),
      ]),
      { rowColour: (r, c) => (c === 3 ? (shown[r]!.r.meetsTarget ? HEALTHY : BROKEN) : undefined) },
    )
  }

  // ------------------------------------------------------------ captures, assumptions, warnings
  heading('Captures that back this revision')
  if (!report.captures.length) text('No oscilloscope capture backs this revision: every number above is computed from the stage parameters.', { size: 8.5, colour: MUTED })
  else {
    text('Measured on the bench and frozen with the revision: 50 % to 50 % delays from the input to the output channel, 10-90 % transition times of the output.', { size: 8.5, colour: MUTED })
    doc.moveDown(0.3)
    for (const c of report.captures) {
      ensure(150)
      text(`Capture ${c.id}: ${c.label || c.fileName}`, { size: 9.5, bold: true })
      keyValues(
        [
          ['File', `${c.fileName} (${c.size.toLocaleString('en')} bytes)${c.available ? '' : ', since deleted'}`],
          ['SHA-256', c.sha256],
          ['Uploaded', `${when(c.uploadedAt)} by ${c.uploadedBy?.name ?? '(former member)'}`],
          [
            'Channels',
            `${c.input ? `in ${c.input.number} "${c.input.name}"` : '-'}${c.output ? ` -> out ${c.output.number} "${c.output.name}"` : ', not paired'}${c.inverting === null ? '' : c.inverting ? ', inverting' : ', non-inverting'}`,
          ],
          ['Samples', `${c.sampleCount.toLocaleString('en')}${c.rl !== undefined ? `, taken at RL ${eng(c.rl, 'ohm')}` : ''}`],
          ...(c.appliedTo ? ([['Applied to', `${c.appliedTo.stageName} (channel ${c.appliedTo.channelId}, stage ${c.appliedTo.stageIndex + 1}) as ${c.appliedTo.as === 'typical' ? 'typical values and spread' : 'a characterisation point'}`]] as [string, string][]) : []),
        ],
        90,
      )
      const rows: [string, SummaryStats | null][] = [
        ['tPLH', c.tPLH],
        ['tPHL', c.tPHL],
        ['tr (output)', c.output?.tr ?? null],
        ['tf (output)', c.output?.tf ?? null],
      ]
      table(
        [
          { label: 'Quantity', width: 80, mono: false, align: 'left' },
          { label: 'Count', width: 50 },
          { label: 'Min', width: 70 },
          { label: 'Mean', width: 70 },
          { label: 'Max', width: 70 },
          { label: 'Sigma', width: 70 },
        ],
        rows.map(([name, st]) => [name, String(st?.count ?? 0), eng(st?.min, 's', 4), eng(st?.mean, 's', 4), eng(st?.max, 's', 4), eng(st?.sigma, 's', 3)]),
      )
    }
  }
  heading('Warnings')
  if (a.warnings.length) bullets(a.warnings.map((w) => `[${w.code}] ${w.message}${w.channel ? ` (${w.channel}${w.stage !== undefined ? `, stage ${w.stage + 1}` : ''})` : ''}`), THIN)
  else text('The engine raised no warning for this input.', { size: 8.5, colour: MUTED })
  heading('Assumptions')
  bullets(report.assumptions)

  // ------------------------------------------------------------ sign-off
  heading('Sign-off')
  keyValues([
    ['State', REPORT_STATE_LABEL[report.state]],
    ['Author', report.author?.name ?? '(former member)'],
    ['Reviewer', report.reviewer?.name ?? 'not yet submitted'],
    ['Submitted', when(report.submittedAt)],
    [report.state === 'returned' ? 'Returned' : 'Signed off', report.decidedAt ? `${when(report.decidedAt)} by ${report.decidedBy?.name ?? '(former member)'}` : '-'],
    ...(report.decisionNote ? ([['Reviewer note', report.decisionNote]] as [string, string][]) : []),
  ])
  if (report.comments.length) {
    doc.moveDown(0.4)
    text('Comments', { size: 9.5, bold: true })
    bullets(report.comments.map((c) => `${commentTargetText(c.target, a)}: ${c.body} (${c.author?.name ?? 'former member'}, ${when(c.createdAt)})`))
  }

  // page footers
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    const saved = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    doc.font('Text').fontSize(7).fillColor(MUTED)
    doc.text(pdfText(`${report.linkName} · ${report.label} · ${REPORT_STATE_LABEL[report.state]} · engine ${report.engineVersion}`), left, doc.page.height - 36, { width: width - 60, lineBreak: false })
    doc.text(`page ${i + 1} of ${range.count}`, left + width - 60, doc.page.height - 36, { width: 60, align: 'right', lineBreak: false })
    doc.page.margins.bottom = saved
  }
  doc.end()
  return done
}

/** How a comment's target reads: "report", "bit d3 of telemetry", "check miso-setup". */
export function commentTargetText(t: ReportDetailDto['comments'][number]['target'], a?: ReportDetailDto['result']): string {
  if (t.kind === 'report') return 'Report'
  if (t.kind === 'check') return `Check ${t.id}`
  if (t.kind === 'stage') {
    const name = a?.channels.find((c) => c.id === t.channelId)?.stages[t.index]?.name
    return `Stage ${t.index + 1} of ${t.channelId}${name ? ` (${name})` : ''}`
  }
  const label = a?.uart?.byChannel.find((c) => c.channelId === t.channelId)?.bits[t.index]?.label
  return `Bit ${label ?? t.index} of ${t.channelId}`
}

/**
 * The bit timeline: each bit's nominal cell, its worst-case valid window (coloured by
 * state, with the margin written in it) and the span of its deciding samples, on a time
 * axis from the start edge's arrival.
 */
function drawTimeline(doc: Doc, ch: UartChannelResult, x0: number, y0: number, w: number) {
  const T = ch.bitTime
  const n = ch.bits.length
  const end = Math.max(n * T, ...ch.bits.map((b) => b.samples.latest), ...ch.bits.map((b) => b.validTo ?? 0))
  const labelW = 34
  const plotW = w - labelW
  const xs = (t: number) => x0 + labelW + (Math.max(0, t) / end) * plotW
  const rowH = 15
  // axis
  doc.font('Text').fontSize(6.5).fillColor(MUTED)
  for (let k = 0; k <= n; k++) {
    const x = xs(k * T)
    doc.moveTo(x, y0).lineTo(x, y0 + n * rowH).lineWidth(0.3).dash(1.5, { space: 1.5 }).strokeColor(RULE).stroke().undash()
  }
  ch.bits.forEach((b, k) => {
    const y = y0 + k * rowH
    const colour = stateColour(b.marginUi, ch.requiredMarginUi)
    doc.font('Mono').fontSize(7).fillColor(INK).text(b.label, x0, y + 4, { width: labelW - 4, features: MONO_FEATURES, lineBreak: false })
    // nominal cell
    doc.rect(xs(k * T), y + 3, xs((k + 1) * T) - xs(k * T), rowH - 6).lineWidth(0.4).strokeColor(RULE).stroke()
    // valid window
    const from = b.validFrom
    const to = b.validTo ?? end
    if (to > from) doc.rect(xs(from), y + 4, Math.max(0.8, xs(to) - xs(from)), rowH - 8).fillOpacity(0.35).fill(colour).fillOpacity(1)
    else doc.rect(xs(to), y + 4, Math.max(0.8, xs(from) - xs(to)), rowH - 8).fillOpacity(0.6).fill(BROKEN).fillOpacity(1)
    // deciding samples
    const sx = xs(b.samples.earliest)
    const sw = Math.max(1.2, xs(b.samples.latest) - sx)
    doc.rect(sx, y + 2, sw, rowH - 4).fill(colour === BROKEN ? BROKEN : INK)
    // the margin beside the cell, or before it when the cell ends near the right edge
    const label = `${formatUi(b.marginUi)} ${stateWord(b.marginUi, ch.requiredMarginUi)}`
    const after = xs((k + 1) * T) + 2
    const lx = after + 80 <= x0 + w ? after : xs(k * T) - 82
    doc.font('Mono').fontSize(6).fillColor(colour).text(label, lx, y + 4.5, { width: 80, align: lx === after ? 'left' : 'right', features: MONO_FEATURES, lineBreak: false })
  })
  const yb = y0 + n * rowH + 3
  doc.font('Mono').fontSize(6.5).fillColor(MUTED)
  for (let k = 0; k <= n; k += Math.max(1, Math.ceil(n / 6))) doc.text(eng(k * T, 's'), xs(k * T) - 20, yb, { width: 40, align: 'center', features: MONO_FEATURES, lineBreak: false })
  doc.font('Text').fontSize(7).fillColor(MUTED).text('Shaded: worst-case valid window of the bit (teal healthy, amber thin, rose broken). Solid bar: the span of the deciding samples. Time from the start edge at the receiver.', x0, yb + 11, { width: w })
  doc.moveDown(0.5)
}

/** Horizontal slack bars of the SPI checks around a zero line. */
function drawSlackBars(doc: Doc, checks: { id: string; slack: number; required: number }[], x0: number, y0: number, w: number) {
  const labelW = 70
  const maxAbs = Math.max(...checks.map((c) => Math.abs(c.slack)), 1e-12)
  const mid = x0 + labelW + (w - labelW - 70) / 2
  const half = (w - labelW - 70) / 2
  const rowH = 13
  checks.forEach((c, i) => {
    const y = y0 + i * rowH
    const colour = stateColour(c.slack, c.required)
    doc.font('Mono').fontSize(7).fillColor(INK).text(c.id, x0, y + 3, { width: labelW - 4, features: MONO_FEATURES, lineBreak: false })
    const len = (Math.abs(c.slack) / maxAbs) * half
    doc.rect(c.slack >= 0 ? mid : mid - len, y + 2, Math.max(0.8, len), rowH - 4).fill(colour)
    doc.font('Mono').fontSize(7).fillColor(colour).text(`${eng(c.slack, 's')} ${stateWord(c.slack, c.required)}`, mid + half + 4, y + 3, { width: 70, features: MONO_FEATURES, lineBreak: false })
  })
  doc.moveTo(mid, y0).lineTo(mid, y0 + checks.length * rowH).lineWidth(0.6).strokeColor(INK).stroke()
  doc.y = y0 + checks.length * rowH + 6
}

/** Margin (UI) against baud on a log axis, with the required margin and the configured rate. */
function drawRateSweep(doc: Doc, u: UartChannelResult, x0: number, y0: number, w: number, h: number) {
  const pts = u.rateSweep.filter((p) => Number.isFinite(p.marginUi) && p.baud > 0)
  if (pts.length < 2) {
    doc.y = y0
    return
  }
  const padL = 40
  const padB = 18
  const pw = w - padL
  const ph = h - padB
  const lx = (b: number) => Math.log10(b)
  const bmin = lx(pts[0]!.baud)
  const bmax = lx(pts[pts.length - 1]!.baud)
  const ymin = Math.max(-1, Math.min(...pts.map((p) => p.marginUi), 0))
  const ymax = Math.max(0.5, ...pts.map((p) => p.marginUi))
  const X = (b: number) => x0 + padL + ((lx(b) - bmin) / (bmax - bmin)) * pw
  const Y = (m: number) => y0 + ph - ((Math.max(ymin, Math.min(ymax, m)) - ymin) / (ymax - ymin)) * ph
  doc.rect(x0 + padL, y0, pw, ph).lineWidth(0.4).strokeColor(RULE).stroke()
  // y grid
  doc.font('Mono').fontSize(6.5).fillColor(MUTED)
  for (let m = Math.ceil(ymin * 4) / 4; m <= ymax + 1e-9; m += 0.25) {
    doc.moveTo(x0 + padL, Y(m)).lineTo(x0 + padL + pw, Y(m)).lineWidth(m === 0 ? 0.8 : 0.2).strokeColor(m === 0 ? INK : RULE).stroke()
    doc.text(m.toFixed(2), x0, Y(m) - 3, { width: padL - 4, align: 'right', features: MONO_FEATURES, lineBreak: false })
  }
  // x decades
  for (let d = Math.ceil(bmin); d <= Math.floor(bmax); d++) {
    doc.moveTo(X(10 ** d), y0).lineTo(X(10 ** d), y0 + ph).lineWidth(0.2).strokeColor(RULE).stroke()
    doc.text(eng(10 ** d, 'Bd'), X(10 ** d) - 20, y0 + ph + 4, { width: 40, align: 'center', features: MONO_FEATURES, lineBreak: false })
  }
  // required margin
  doc.moveTo(x0 + padL, Y(u.requiredMarginUi)).lineTo(x0 + padL + pw, Y(u.requiredMarginUi)).lineWidth(0.7).dash(3, { space: 2 }).strokeColor(THIN).stroke().undash()
  // the curve
  doc.moveTo(X(pts[0]!.baud), Y(pts[0]!.marginUi))
  for (const p of pts.slice(1)) doc.lineTo(X(p.baud), Y(p.marginUi))
  doc.lineWidth(1.2).strokeColor(HEALTHY).stroke()
  // configured rate
  if (u.worstMarginUi !== null && u.baud >= pts[0]!.baud && u.baud <= pts[pts.length - 1]!.baud) {
    const cx = X(u.baud)
    const cy = Y(u.worstMarginUi)
    doc.circle(cx, cy, 2.5).fill(stateColour(u.worstMarginUi, u.requiredMarginUi))
    doc.font('Mono').fontSize(6.5).fillColor(INK).text(`${eng(u.baud, 'Bd', 4)}: ${formatUi(u.worstMarginUi)}`, cx + 4, cy - 9, { width: 120, features: MONO_FEATURES, lineBreak: false })
  }
  if (u.maxBaud !== null && u.maxBaud >= pts[0]!.baud && u.maxBaud <= pts[pts.length - 1]!.baud) {
    const mx = X(u.maxBaud)
    doc.moveTo(mx, y0).lineTo(mx, y0 + ph).lineWidth(0.6).dash(1, { space: 2 }).strokeColor(INK).stroke().undash()
    doc.font('Mono').fontSize(6.5).fillColor(INK).text(`max ${eng(u.maxBaud, 'Bd', 4)}`, mx + 3, y0 + 3, { width: 90, features: MONO_FEATURES, lineBreak: false })
  }
  doc.y = y0 + h + 4
}
