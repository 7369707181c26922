/**
 * One renderer per section of the margin report PDF, in the order the report reads: title
 * and sign-off, summary and caution, stages and settings, per-bit margins or SPI checks,
 * rate sweep and standard rates, pull-up choice, captures, warnings, assumptions, review.
 * Each draws the frozen revision through the shared layout; the words and table columns are
 * the shared report vocabulary's.
 */
import { REPORT_STATE_LABEL } from '../../../shared/schemas/report'
import type { ReportDetailDto, RevisionComparisonDto } from '../../../shared/types/report'
import type { MarginChange } from '../../../shared/report/compare'
import type { SummaryStats } from '../../../shared/types/capture'
import {
  MARGIN_LABEL,
  groupWarnings,
  limitWords,
  maxRateText,
  spiSlackState,
  uartMarginState,
  type ReadingThresholds,
} from '../../../shared/report/vocabulary'
import { bitColumns, busCheckColumns, canLengthColumns, canTimingColumns, endClockWords, i2cLevelColumns, i2cPullupColumns, pullupColumns, spiCandidateColumns, spiCheckColumns, splitStandardRates, stageColumns, standardRateColumns } from '../../../shared/report/tables'
import { SAFETY_CAUTION } from '../../../shared/utils/caution'
import { formatEng, formatUi } from '../../../shared/utils/units'
import { drawBusTimeline, drawRateSweep, drawSlackBars, drawTimeline } from './charts'
import { INK, MUTED, STATE_COLOUR, type Layout } from './layout'

type Report = ReportDetailDto
const eng = (v: number | null | undefined, unit: string, digits = 3) => formatEng(v, unit, { digits })
/** An ISO instant as the report prints it: 2026-12-03 09:30 UTC. */
export const when = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : '–')
const person = (p: { name: string } | null | undefined, none = '(former member)') => p?.name ?? none
const thresholds = (r: Report): ReadingThresholds | undefined => r.thresholds ?? undefined

/** The title and, on page 1, who signed what and when. */
export function titleSection(L: Layout, r: Report) {
  L.text('Bitslack margin report', { size: 9, colour: MUTED })
  L.text(r.linkName, { size: 18, bold: true })
  L.text(`${r.projectName} · revision ${r.label} · ${REPORT_STATE_LABEL[r.state]}`, { size: 10, colour: MUTED })
  L.doc.moveDown(0.6)
  L.keyValues(signOffRows(r).slice(0, 6))
}

/** The review's facts: state, author, reviewer, decision, revision, engine. */
function signOffRows(r: Report): [string, string][] {
  const decided: [string, string] =
    r.state === 'returned'
      ? ['Returned', `${when(r.decidedAt)} by ${person(r.decidedBy)}`]
      : ['Signed off', r.state === 'signed-off' ? `${when(r.decidedAt)} by ${person(r.decidedBy)}` : 'not signed off']
  return [
    ['State', REPORT_STATE_LABEL[r.state]],
    ['Reviewer', r.reviewer ? `${r.reviewer.name}${r.submittedAt ? `, asked ${when(r.submittedAt)}` : ''}` : 'not yet submitted'],
    decided,
    ['Frozen', `${when(r.createdAt)} by ${person(r.author)}`],
    ['Revision', `${r.label} of link version ${r.linkVersion}, ${r.protocol.toUpperCase()}`],
    ['Engine', r.engineVersion],
    ...(r.decisionNote ? ([['Reviewer note', r.decisionNote]] as [string, string][]) : []),
  ]
}

/** The verdict and the few numbers that decide it. */
export function summarySection(L: Layout, r: Report) {
  const { doc, left, width } = L
  const a = r.result
  L.heading('Summary')
  const y = doc.y
  const verdictColour = a.verdict === 'pass' ? STATE_COLOUR.healthy : a.verdict === 'marginal' ? STATE_COLOUR.thin : STATE_COLOUR.broken
  doc.roundedRect(left, y, 92, 26, 3).fill(verdictColour)
  L.write(a.verdict.toUpperCase(), 'textBold', { size: 13, colour: '#ffffff', width: 92, align: 'center' }, left, y + 6)
  doc.y = y
  L.keyValues([...uartSummary(r), ...spiSummary(r), ...busSummary(r)], 86, left + 104, width - 104)
  doc.moveDown(0.8)
  L.box('Safety caution.', SAFETY_CAUTION, STATE_COLOUR.thin, '#fffbeb')
}

function busSummary(r: Report): [string, string][] {
  const a = r.result
  const limit = (id: string | null, checks: { id: string; label: string }[]) => (id ? `${id}: ${checks.find((c) => c.id === id)?.label ?? ''}` : 'none')
  if (a.i2c)
    return [
      ['Worst slack', `${eng(a.i2c.worstSlack, 's')}, required ${eng(r.input.i2c?.requiredSlack ?? 0, 's')}`],
      ['Highest SCL', `${a.i2c.maxSclHz === null ? 'none' : eng(a.i2c.maxSclHz, 'Hz')} (configured ${eng(a.i2c.sclHz, 'Hz')}, ${a.i2c.mode} mode)`],
      ['Limited by', limit(a.i2c.limiting, [...a.i2c.checks, ...a.i2c.levelChecks])],
    ]
  if (a.can)
    return [
      ['Worst slack', eng(a.can.worstSlack, 's')],
      ['Longest bus', `${a.can.maxBusLength === null ? 'none' : eng(a.can.maxBusLength, 'm')} at ${eng(a.can.bitRate, 'bit/s')} (this bus ${eng(r.input.can?.busLength, 'm')})`],
      ['Limited by', limit(a.can.limiting, a.can.checks)],
    ]
  if (a.rs485 && a.rs485.checks.length)
    return [
      ['Turnaround slack', eng(a.rs485.worstSlack, 's')],
      ['Shortest DE lead / lag', `${eng(a.rs485.minLeadTime, 's')} / ${eng(a.rs485.minLagTime, 's')}`],
      ['Turnaround limited by', limit(a.rs485.limiting, a.rs485.checks)],
    ]
  return []
}

function uartSummary(r: Report): [string, string][] {
  const uart = r.result.uart
  if (!uart) return []
  const wb = uart.worstBit === null ? undefined : uart.bits[uart.worstBit]
  const state = uartMarginState(uart.worstMarginUi, uart.requiredMarginUi, thresholds(r))
  return [
    [
      'Worst margin',
      uart.worstMarginUi === null
        ? `none: ${uart.noMarginReason}`
        : `${formatUi(uart.worstMarginUi)} (${eng(wb?.margin, 's')}), required ${formatUi(uart.requiredMarginUi)}: ${MARGIN_LABEL[state]}`,
    ],
    ['Maximum baud', `${maxRateText(uart.maxBaud, uart.maxBaudCapped, 'Bd', 4)} (configured ${eng(uart.baud, 'Bd', 4)})`],
    ...(wb ? ([['Limited by', `bit ${wb.label}, ${wb.side} side: ${limitWords(wb.limitedBy)}`]] as [string, string][]) : []),
    ['Note', uart.maxBaudNote],
  ]
}

function spiSummary(r: Report): [string, string][] {
  const spi = r.result.spi
  if (!spi) return []
  const wc = spi.checks.find((c) => c.id === spi.worstCheck)
  const capped = spi.maxSclkHz !== null && spi.limitingCheck === null
  return [
    [
      'Worst slack',
      spi.worstSlack === null
        ? `none: ${spi.noSlackReason}`
        : `${eng(spi.worstSlack, 's')} (${spi.worstCheck}), required ${eng(wc?.required ?? 0, 's')}: ${MARGIN_LABEL[spiSlackState(spi.worstSlack, wc?.required ?? 0, spi.halfPeriod, thresholds(r))]}`,
    ],
    ['Maximum SCLK', `${maxRateText(spi.maxSclkHz, capped, 'Hz', 4)} (configured ${eng(spi.sclkHz, 'Hz', 4)}, mode ${spi.mode})`],
    ['Limited by', spi.limitingCheck ? `${spi.limitingCheck}: ${spi.checks.find((c) => c.id === spi.limitingCheck)?.description ?? ''}` : 'no check up to the SCLK limit'],
    ['Round trip', `${eng(spi.roundTrip.min, 's')} to ${eng(spi.roundTrip.max, 's')}`],
  ]
}

/** Each channel's stages as the engine read them, its chain delays and receiver. */
export function stagesSection(L: Layout, r: Report) {
  L.heading('Stages and settings')
  for (const ch of r.result.channels) {
    const spec = r.input.channels.find((c) => c.id === ch.id)
    L.subheading(`Channel ${ch.id} (${ch.role})${spec?.label ? `: ${spec.label}` : ''}`)
    L.table(stageColumns(), ch.stages)
    const rx = spec?.receiver
    L.keyValues([
      ['Chain delay rise', `${eng(ch.rise.min, 's')} / ${eng(ch.rise.typ, 's')} / ${eng(ch.rise.max, 's')} (min / typ / max)`],
      ['Chain delay fall', `${eng(ch.fall.min, 's')} / ${eng(ch.fall.typ, 's')} / ${eng(ch.fall.max, 's')}`],
      ['PWD (rise − fall)', `${eng(ch.pwd.min, 's')} to ${eng(ch.pwd.max, 's')}, typ ${eng(ch.pwdTyp, 's')}`],
      ['Received tr / tf', `${eng(ch.tr.max, 's')} / ${eng(ch.tf.max, 's')} max`],
      ['Polarity', `${ch.polarity}${ch.functional ? '' : ' (the channel cannot carry data as set)'}`],
      ...(rx
        ? ([['Receiver', `VDD ${eng(rx.vdd, 'V')}, VIL ${eng(rx.vil, 'V')}, VIH ${eng(rx.vih, 'V')}${rx.schmitt ? ', Schmitt' : ''}${rx.invert ? ', inverted' : ''}`]] as [string, string][])
        : []),
    ])
    L.doc.moveDown(0.5)
  }
}

type ClockSpec = { errorPpm?: number; clockHz?: number; tolerancePpm?: number; fractionBits?: number }
const clockWords = (c: ClockSpec) =>
  c.clockHz !== undefined
    ? `generator ${eng(c.clockHz, 'Hz', 4)}${c.fractionBits ? `, ${c.fractionBits} fraction bits` : ''}${c.tolerancePpm !== undefined ? `, ±${c.tolerancePpm} ppm` : ''}`
    : `±${c.errorPpm} ppm`

/** The protocol's settings as frozen. */
export function settingsSection(L: Layout, r: Report) {
  const u = r.input.uart
  if (u) {
    L.subheading('UART settings')
    L.keyValues([
      ['Baud', eng(u.baud, 'Bd', 4)],
      ['Frame', `${u.dataBits} data, parity ${u.parity}, ${u.stopBits} stop${u.backToBack ? ', back to back' : ''}`],
      ['Required margin', formatUi(u.requiredMarginUi)],
      ...(r.thresholds && r.thresholds.guardBandUi > 0 ? ([['Healthy from', `${formatUi(u.requiredMarginUi + r.thresholds.guardBandUi)} (team guard band)`]] as [string, string][]) : []),
      ['Transmitter clock', clockWords(u.tx)],
      ['Receiver clock', clockWords(u.rx)],
      ['Receiver sampler', `${u.rx.sampler}, ${u.rx.oversampling}×, vote ${u.rx.vote}${u.rx.sampleTicks ? `, ticks ${u.rx.sampleTicks.join(' ')}` : ''}`],
    ])
  }
  const i = r.input.i2c
  if (i) {
    L.subheading('I2C settings')
    L.keyValues([
      ['Mode and SCL', `${i.mode}, ${eng(i.sclHz, 'Hz')}${i.dutyLow !== undefined ? `, low ${Math.round(i.dutyLow * 1000) / 10} %` : ''}`],
      ['Controller side', `VDD ${eng(i.controller.vdd, 'V')}, Rp ${eng(i.controller.rp, 'Ω')}, Cb ${eng(i.controller.cb, 'F')}, data hold ${eng(i.controller.tHdDat, 's')}`],
      ['Target side', `VDD ${eng(i.target.vdd, 'V')}, Rp ${eng(i.target.rp, 'Ω')}, Cb ${eng(i.target.cb, 'F')}${i.target.tVdDat !== undefined ? `, tVD;DAT ${eng(i.target.tVdDat, 's')}` : ''}`],
      ...(i.isolator.lowOffset !== undefined ? ([['Isolator offset', `${eng(i.isolator.lowOffset, 'V')} on the ${i.isolator.offsetSide} side`]] as [string, string][]) : []),
    ])
  }
  const c = r.input.can
  if (c) {
    L.subheading('CAN settings')
    L.keyValues([
      ['Bit rate and clock', `${eng(c.bitRate, 'bit/s')} from ${eng(c.clockHz, 'Hz')}, sample point ${Math.round(c.samplePoint * 1000) / 10} %`],
      ['Bus', `${eng(c.busLength, 'm')} at ${eng(c.delayPerMetre, 's')}/m`],
      ...(c.timing ? ([['Firmware setting', `BRP ${c.timing.brp}, Prop_Seg ${c.timing.propSeg}, Phase_Seg1 ${c.timing.phaseSeg1}, Phase_Seg2 ${c.timing.phaseSeg2}, SJW ${c.timing.sjw}`]] as [string, string][]) : []),
      ...(c.fd ? ([['CAN FD data phase', `${eng(c.fd.dataBitRate, 'bit/s')}, sample point ${Math.round(c.fd.dataSamplePoint * 1000) / 10} %, delay compensation ${c.fd.tdc ? 'on' : 'off'}`]] as [string, string][]) : []),
    ])
  }
  const rs = r.input.rs485
  if (rs) {
    L.subheading('RS-485 settings')
    L.keyValues([['Duplex and DE', `${rs.duplex} duplex, DE lead ${eng(rs.leadTime, 's')}, lag ${eng(rs.lagTime, 's')}`]])
  }
  const s = r.input.spi
  if (s) {
    L.subheading('SPI settings')
    L.keyValues([
      ['SCLK', `${eng(s.sclkHz, 'Hz', 4)}, CPOL ${s.cpol}, CPHA ${s.cpha}`],
      ['Required slack', eng(s.requiredSlack, 's')],
      ...(r.thresholds && r.thresholds.thinSlackFraction > 0 ? ([['Thin below', `${Math.round(r.thresholds.thinSlackFraction * 100)} % of T/2 (team policy)`]] as [string, string][]) : []),
      ['Controller MISO', `setup ${eng(s.controller.misoSetup, 's')}, hold ${eng(s.controller.misoHold, 's')}${s.controller.delayedSampling ? ', delayed sampling' : ''}`],
      ['Peripheral', `MOSI setup ${eng(s.peripheral.mosiSetup, 's')}, hold ${eng(s.peripheral.mosiHold, 's')}, clock to out ${eng(s.peripheral.clockToOut.min, 's')} to ${eng(s.peripheral.clockToOut.max, 's')}`],
      ...s.packages.map((p, i) => [`Package ${i + 1}`, `${p.channels.join(', ')}: channel skew ${eng(p.channelSkew, 's')}`] as [string, string]),
    ])
  }
}

/** I2C, CAN and RS-485: the bus timeline, every check, and the tables that say what to change. */
export function busSection(L: Layout, r: Report) {
  const { i2c, can, rs485 } = r.result
  if (i2c) {
    L.heading('I2C checks', true)
    L.note(`${i2c.mode} mode at SCL ${eng(i2c.sclHz, 'Hz')}, SCL low ${Math.round(i2c.dutyLow * 1000) / 10} % of the period; round trip ${eng(i2c.roundTrip, 's')}. A check passes when its slack meets the required slack (UM10204 limits).`)
    L.doc.moveDown(0.3)
    L.table(busCheckColumns(), i2c.checks)
    L.subheading('Levels and pull-ups')
    L.table(i2cLevelColumns(), i2c.levelChecks)
    L.ensure(200)
    L.subheading('Bus timeline')
    drawBusTimeline(L, i2c.timeline, L.left, L.doc.y + 10, L.width)
    L.doc.x = L.left
    for (const sw of i2c.pullupSweep) {
      L.heading(`Pull-up sweep, ${sw.side} side (${sw.series})`)
      L.table(i2cPullupColumns(), sw.rows)
    }
  }
  if (can) {
    L.heading('CAN checks', true)
    L.note(`At ${eng(can.bitRate, 'bit/s')} from a ${eng(can.clockHz, 'Hz')} clock; loop delay ${eng(can.node.loopDelay, 's')}, Prop_Seg must cover ${eng(can.propagation, 's')}; setting checked: ${can.chosenFrom === 'settings' ? "the firmware's" : "the table's best"}.`)
    L.doc.moveDown(0.3)
    L.table(busCheckColumns(), can.checks)
    L.ensure(180)
    L.subheading('One bit')
    drawBusTimeline(L, can.timeline, L.left, L.doc.y + 10, L.width)
    L.doc.x = L.left
    L.heading('Bit-timing table')
    L.table(canTimingColumns(), can.bitTimings)
    L.subheading('Longest bus per bit rate')
    L.table(canLengthColumns(), can.lengthByRate)
  }
  if (rs485 && rs485.checks.length) {
    L.heading('RS-485 turnaround', true)
    L.note(`Data to the bus ${eng(rs485.dataPath.min, 's')} to ${eng(rs485.dataPath.max, 's')}; driver enable ${eng(rs485.driverEnable, 's')}, disable ${eng(rs485.driverDisable, 's')}; shortest DE lead ${eng(rs485.minLeadTime, 's')}, lag ${eng(rs485.minLagTime, 's')}.`)
    L.doc.moveDown(0.3)
    L.table(busCheckColumns(), rs485.checks)
    if (rs485.timeline) {
      L.ensure(150)
      drawBusTimeline(L, rs485.timeline, L.left, L.doc.y + 10, L.width)
      L.doc.x = L.left
    }
  }
}

/** Per UART direction: the per-bit table and the bit timeline. */
export function bitsSection(L: Layout, r: Report) {
  const uart = r.result.uart
  if (!uart) return
  for (const ch of uart.byChannel) {
    L.heading(`Per-bit margins: ${ch.channelId}`, true)
    L.note(`At ${eng(ch.baud, 'Bd', 4)}, bit time ${eng(ch.bitTime, 's')}; margins are the worst over every data value.`)
    L.doc.moveDown(0.3)
    L.table(bitColumns(ch.requiredMarginUi, thresholds(r)), ch.bits)
    L.ensure(200)
    L.subheading('Bit timeline')
    drawTimeline(L, ch, L.left, L.doc.y + 4, L.width, thresholds(r))
    L.doc.x = L.left
  }
}

/** The SPI checks as bars and a table, and the candidate clocks. */
export function spiSection(L: Layout, r: Report) {
  const spi = r.result.spi
  if (!spi) return
  L.heading('SPI checks', true)
  L.note(`At SCLK ${eng(spi.sclkHz, 'Hz', 4)} (half period ${eng(spi.halfPeriod, 's')}); a check passes when its slack meets the required slack.`)
  L.doc.moveDown(0.3)
  L.table(spiCheckColumns(spi.halfPeriod, thresholds(r)), spi.checks)
  L.ensure(150)
  L.subheading('Slack per check')
  drawSlackBars(L, spi.checks, spi.halfPeriod, L.left, L.doc.y + 4, L.width, thresholds(r))
  L.doc.x = L.left
  L.heading('SCLK candidates')
  L.table(spiCandidateColumns(), spi.candidates)
}

/** The rate sweep chart and the standard rates with both ends' divisors. */
export function ratesSection(L: Layout, r: Report) {
  const uart = r.result.uart
  if (!uart) return
  L.heading('Rate sweep', true)
  L.note(`Worst margin of ${uart.channelId} against baud (logarithmic); the dashed line is the required margin, the dot the configured rate.`)
  drawRateSweep(L, uart, L.left, L.doc.y + 6, L.width, 190, thresholds(r))
  L.doc.x = L.left
  L.doc.moveDown(0.6)
  const ends = {
    tx: endClockWords(uart.clocks.tx, r.input.uart?.tx.clockHz),
    rx: endClockWords(uart.clocks.rx, r.input.uart?.rx.clockHz),
  }
  const { shown, hidden } = splitStandardRates(uart.standardRates, uart.maxBaud)
  const fastest = uart.standardRates.find((x) => x.baud === uart.fastestStandardRate)
  L.text(fastest ? `Fastest standard rate that passes: ${eng(fastest.baud, 'Bd', 4)}.` : 'No standard rate passes.', { size: 8.5 })
  L.doc.moveDown(0.2)
  L.table(standardRateColumns(uart.requiredMarginUi, uart.fastestStandardRate, ends, thresholds(r)), shown, { caption: "Standard rates with the transmitter's and the receiver's baud-generator divisor and rate error" })
  if (hidden.length) L.text(`Every standard rate above ${eng(shown.at(-1)?.baud ?? 0, 'Bd', 4)} fails (${hidden.length} more, margins below −1 UI); the CSV export lists them all.`, { size: 8, colour: STATE_COLOUR.broken })
}

/** The pull-up sweep frozen with the revision: this revision's row, the recommendation, faster rows. */
export function pullupSection(L: Layout, r: Report) {
  const p = r.pullup
  if (!p) return
  L.heading('Pull-up choice')
  const rec = p.sweep.recommended !== null ? p.sweep.rows[p.sweep.recommended] : null
  L.keyValues([
    ['Stage', `channel ${p.sweep.channelId}, stage ${p.sweep.stageIndex + 1}`],
    ['In this revision', `RL ${eng(p.rl, 'Ω')}, LED resistor ${p.rLed === null ? 'from the LED current' : eng(p.rLed, 'Ω')}`],
    ['Recommended', rec ? `RL ${eng(rec.rl, 'Ω')}, LED resistor ${eng(rec.rLed, 'Ω')}, max ${eng(rec.maxBaud, 'Bd', 4)}` : 'no row meets the target within the ratings'],
    ['Sweep', `${p.sweep.series}, target ${eng(p.sweep.targetBaud, 'Bd', 4)}, overdrive ${p.sweep.overdrive}`],
  ])
  const rows = p.sweep.rows
  const picked = new Set<number>([...(p.chosenRow !== null ? [p.chosenRow] : []), ...(p.sweep.recommended !== null ? [p.sweep.recommended] : []), ...p.sweep.alternatives.slice(0, 3)])
  const shown = rows.filter((_, i) => picked.has(i) || rows.length <= 16)
  const role = (row: (typeof rows)[number]) => {
    const i = rows.indexOf(row)
    return [i === p.chosenRow ? 'this revision' : '', i === p.sweep.recommended ? 'recommended' : '', row.fasterAlternative ? 'faster' : ''].filter(Boolean).join(', ') || '–'
  }
  L.table(pullupColumns(p.sweep.requiredMarginUi, { rbe: (p.sweep.rbeValues?.length ?? 0) > 0, role, t: thresholds(r) }), shown)
}

/** The scope captures frozen with the revision, with their measured statistics. */
export function capturesSection(L: Layout, r: Report) {
  L.heading('Captures that back this revision')
  if (!r.captures.length) {
    L.text('No oscilloscope capture backs this revision: every number above is computed from the stage parameters.', { size: 8.5, colour: MUTED })
    return
  }
  L.text('Measured on the bench and frozen with the revision: 50 % to 50 % delays from the input to the output channel, 10–90 % transition times of the output.', { size: 8.5, colour: MUTED })
  L.doc.moveDown(0.3)
  for (const c of r.captures) {
    L.ensure(150)
    L.subheading(`Capture ${c.id}: ${c.label || c.fileName}`)
    L.keyValues(
      [
        ['File', `${c.fileName} (${c.size.toLocaleString('en')} bytes)${c.available ? '' : ', since deleted'}`],
        ['SHA-256', c.sha256],
        ['Uploaded', `${when(c.uploadedAt)} by ${person(c.uploadedBy)}`],
        ['Channels', `${c.input ? `in ${c.input.number} "${c.input.name}"` : '–'}${c.output ? ` → out ${c.output.number} "${c.output.name}"` : ', not paired'}${c.inverting === null ? '' : c.inverting ? ', inverting' : ', non-inverting'}`],
        ['Samples', `${c.sampleCount.toLocaleString('en')}${c.rl !== undefined ? `, taken at RL ${eng(c.rl, 'Ω')}` : ''}`],
        ...(c.appliedTo
          ? ([['Applied to', `${c.appliedTo.stageName} (channel ${c.appliedTo.channelId}, stage ${c.appliedTo.stageIndex + 1}) as ${c.appliedTo.as === 'typical' ? 'typical values and spread' : 'a characterisation point'}`]] as [string, string][])
          : []),
      ],
      90,
    )
    const stats: { name: string; st: SummaryStats | null }[] = [
      { name: 'tPLH', st: c.tPLH },
      { name: 'tPHL', st: c.tPHL },
      { name: 'tr (output)', st: c.output?.tr ?? null },
      { name: 'tf (output)', st: c.output?.tf ?? null },
    ]
    L.table(
      [
        { key: 'q', label: 'Quantity', value: (x) => x.name, width: 80 },
        { key: 'n', label: 'Count', numeric: true, value: (x) => x.st?.count ?? 0, width: 50 },
        { key: 'min', label: 'Min', numeric: true, value: (x) => x.st?.min ?? null, text: (x) => eng(x.st?.min, 's', 4), width: 70 },
        { key: 'mean', label: 'Mean', numeric: true, value: (x) => x.st?.mean ?? null, text: (x) => eng(x.st?.mean, 's', 4), width: 70 },
        { key: 'max', label: 'Max', numeric: true, value: (x) => x.st?.max ?? null, text: (x) => eng(x.st?.max, 's', 4), width: 70 },
        { key: 'sigma', label: 'σ', numeric: true, value: (x) => x.st?.sigma ?? null, text: (x) => eng(x.st?.sigma, 's', 3), width: 70 },
      ],
      stats,
    )
  }
}

/** The engine's warnings (each said once, with where it applies) and assumptions. */
export function notesSection(L: Layout, r: Report) {
  L.heading('Warnings')
  const warnings = groupWarnings(r.result.warnings)
  if (warnings.length) L.bullets(warnings.map((w) => `${w.words}: ${w.message}${w.where.length ? ` (${w.where.join('; ')})` : ''}`), STATE_COLOUR.thin)
  else L.text('The engine raised no warning for this input.', { size: 8.5, colour: MUTED })
  L.heading('Assumptions')
  L.bullets(r.assumptions)
}

/** The review in full: every fact of page 1 and the comments. */
export function reviewSection(L: Layout, r: Report) {
  L.heading('Sign-off')
  L.keyValues(signOffRows(r))
  if (r.comments.length) {
    L.doc.moveDown(0.4)
    L.subheading('Comments')
    L.bullets(r.comments.map((c) => `${commentTargetText(c.target, r.result)}: ${c.body} (${c.author?.name ?? 'former member'}, ${when(c.createdAt)})`), INK)
  }
}

/** How a comment's target reads: "Report", "Bit d3 of telemetry", "Check miso-setup". */
export function commentTargetText(t: Report['comments'][number]['target'], a?: Report['result']): string {
  if (t.kind === 'report') return 'Report'
  if (t.kind === 'check') return `Check ${t.id}`
  if (t.kind === 'stage') {
    const name = a?.channels.find((c) => c.id === t.channelId)?.stages[t.index]?.name
    return `Stage ${t.index + 1} of ${t.channelId}${name ? ` (${name})` : ''}`
  }
  const label = a?.uart?.byChannel.find((c) => c.channelId === t.channelId)?.bits[t.index]?.label
  return `Bit ${label ?? t.index} of ${t.channelId}`
}

const changeValue = (v: number | null, unit: MarginChange['unit']) => (v === null ? 'none' : unit === 'UI' ? formatUi(v) : eng(v, unit))
const changeDelta = (m: MarginChange) => (m.change === null ? '' : `  (${m.unit === 'UI' ? formatUi(m.change) : `${m.change >= 0 ? '+' : ''}${eng(m.change, m.unit)}`})`)
const inputValue = (v: unknown) => (v === undefined ? '(none)' : typeof v === 'string' ? v : typeof v === 'number' ? String(Number(v.toPrecision(6))) : JSON.stringify(v))

/** A revision after r1: what changed since the one before it, inputs by stage and settings, the margins biggest change first. */
export function changesSection(L: Layout, r: Report, changes: RevisionComparisonDto | null) {
  if (!changes) return
  L.heading(`Changes since ${changes.from.label}`)
  L.note(`From ${changes.from.label} (link version ${changes.from.linkVersion}, ${changes.from.state ? REPORT_STATE_LABEL[changes.from.state] : 'saved'}) to ${r.label} (link version ${changes.to.linkVersion}), from the frozen inputs and results of both.`)
  L.doc.moveDown(0.3)
  L.keyValues([['Verdict', `${changes.verdict.a} -> ${changes.verdict.b}`]])
  if (!changes.inputs.length) L.note('No input changed.')
  for (const g of changes.inputs) {
    L.subheading(g.title)
    L.keyValues(g.changes.map((c) => [c.path, `${inputValue(c.a)} -> ${inputValue(c.b)}`] as [string, string]), 190)
  }
  if (changes.margins.length) {
    L.subheading('Margins, biggest change first')
    L.keyValues(changes.margins.slice(0, 24).map((m) => [m.what, `${changeValue(m.a, m.unit)} -> ${changeValue(m.b, m.unit)}${changeDelta(m)}`] as [string, string]), 190)
    if (changes.margins.length > 24) L.note(`${changes.margins.length - 24} smaller changes are on the report page's comparison.`)
  }
}
