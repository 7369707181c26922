/**
 * The column specs of every result table, written once (issue 12): the workspace and the
 * report page show them (TableSortable), the PDF draws them, the CSV exports them. A column
 * has a raw value (SI numbers or codes: what is sorted and exported) and a text (what is
 * read, with units); `state` colours a cell by the margin it shows; `only` keeps a column to
 * some of the renderers (the CSV carries the instants a screen has no room for).
 */
import type { BusCheck, CanBitTimingRow, CanLinkResult, ChannelResult, I2cLinkResult, PullupSweepRow, SpiCandidate, SpiCheck, StandardRateRow, UartBitResult } from '../types/analysis'
import { formatEng, formatPercent, formatUi } from '../utils/units'
import {
  MARGIN_LABEL,
  divisorText,
  hexByte,
  limitWords,
  marginState,
  rateErrorText,
  spiSlackState,
  uartMarginState,
  type MarginState,
  type ReadingThresholds,
} from './vocabulary'

export type TableTarget = 'screen' | 'pdf' | 'csv'

export interface ReportColumn<R> {
  key: string
  /** header on the screen and in the PDF */
  label: string
  /** CSV header with its unit ("margin (UI)"); the label when absent */
  csvLabel?: string
  /** right-aligned monospaced numbers */
  numeric?: boolean
  /** the raw value: sorted on and exported */
  value: (row: R) => string | number | boolean | null
  /** the cell as read (default: the value) */
  text?: (row: R) => string
  /** the margin state the cell shows (coloured, never by colour alone: the text says it too) */
  state?: (row: R) => MarginState
  /** relative width in the PDF (points on A4) */
  width?: number
  /** renderers that show the column (default: all) */
  only?: TableTarget[]
  /** on screen: in the row's expandable details instead of a column */
  detail?: boolean
}

/** The columns of `columns` a renderer shows. */
export function columnsFor<R>(columns: ReportColumn<R>[], target: TableTarget): ReportColumn<R>[] {
  return columns.filter((c) => !c.only || c.only.includes(target))
}
/** The text of a cell. */
export function cellText<R>(c: ReportColumn<R>, row: R): string {
  if (c.text) return c.text(row)
  const v = c.value(row)
  return v === null ? '–' : String(v)
}

const s = (v: number | null | undefined) => formatEng(v, 's')

// ---------------------------------------------------------------- UART

/** Per-bit margins of one direction. */
export function bitColumns(requiredUi: number, t?: ReadingThresholds): ReportColumn<UartBitResult>[] {
  const state = (b: UartBitResult) => uartMarginState(b.marginUi, requiredUi, t)
  return [
    { key: 'index', label: '#', csvLabel: 'bit', numeric: true, value: (b) => b.index, width: 20, only: ['screen', 'csv'] },
    { key: 'label', label: 'Bit', csvLabel: 'label', value: (b) => b.label, width: 34 },
    { key: 'early', label: 'Early margin', csvLabel: 'early margin (s)', numeric: true, value: (b) => b.earlyMargin, text: (b) => s(b.earlyMargin), width: 60 },
    { key: 'late', label: 'Late margin', csvLabel: 'late margin (s)', numeric: true, value: (b) => b.lateMargin, text: (b) => (b.lateMargin === null ? 'no end' : s(b.lateMargin)), width: 60 },
    { key: 'marginS', label: 'Margin (s)', csvLabel: 'margin (s)', numeric: true, value: (b) => b.margin, only: ['csv'] },
    { key: 'margin', label: 'Margin', csvLabel: 'margin (UI)', numeric: true, value: (b) => b.marginUi, text: (b) => formatUi(b.marginUi), state, width: 56 },
    { key: 'state', label: 'State', value: (b) => MARGIN_LABEL[state(b)], state, width: 46 },
    { key: 'side', label: 'Side', value: (b) => b.side, width: 34 },
    { key: 'limitedBy', label: 'Limited by', csvLabel: 'limited by', value: (b) => b.limitedBy, text: (b) => limitWords(b.limitedBy), width: 100 },
    { key: 'pattern', label: 'Worst data', csvLabel: 'worst data value', numeric: true, value: (b) => b.worstPattern, text: (b) => hexByte(b.worstPattern), width: 48 },
    { key: 'validFrom', label: 'Valid from', csvLabel: 'valid from (s)', numeric: true, value: (b) => b.validFrom, only: ['csv'] },
    { key: 'validTo', label: 'Valid to', csvLabel: 'valid to (s)', numeric: true, value: (b) => b.validTo, only: ['csv'] },
    { key: 'earliest', label: 'Earliest sample', csvLabel: 'earliest sample (s)', numeric: true, value: (b) => b.samples.earliest, only: ['csv'] },
    { key: 'latest', label: 'Latest sample', csvLabel: 'latest sample (s)', numeric: true, value: (b) => b.samples.latest, only: ['csv'] },
  ]
}

/** What the divisor columns say about each end's clock ("80 MHz", "±2 %, no generator"). */
export interface RateTableEnds {
  tx: string
  rx: string
}

/** The standard rates, with both ends' baud-generator divisor and rate error. */
export function standardRateColumns(requiredUi: number, fastest: number | null, ends: RateTableEnds, t?: ReadingThresholds): ReportColumn<StandardRateRow>[] {
  const state = (r: StandardRateRow) => uartMarginState(r.marginUi, requiredUi, t)
  return [
    { key: 'baud', label: 'Baud', csvLabel: 'baud (Bd)', numeric: true, value: (r) => r.baud, text: (r) => formatEng(r.baud, 'Bd', { digits: 4 }), width: 62 },
    { key: 'margin', label: 'Worst margin', csvLabel: 'margin (UI)', numeric: true, value: (r) => r.marginUi, text: (r) => (r.marginUi === null ? (r.note ?? '–') : formatUi(r.marginUi)), state, width: 70 },
    { key: 'pass', label: 'Result', csvLabel: 'pass', value: (r) => r.pass, text: (r) => (r.baud === fastest ? 'pass, fastest' : r.pass ? 'pass' : 'fail'), state: (r) => (r.pass ? 'healthy' : 'broken'), width: 60 },
    { key: 'txDivisor', label: `TX divisor (${ends.tx})`, csvLabel: 'TX divisor', numeric: true, value: (r) => r.generators.tx?.divisor ?? null, text: (r) => divisorText(r.generators.tx?.divisor), width: 80 },
    { key: 'txError', label: 'TX rate error', csvLabel: 'TX rate error (fraction)', numeric: true, value: (r) => r.generators.tx?.error ?? null, text: (r) => rateErrorText(r.generators.tx?.error), width: 58 },
    { key: 'rxDivisor', label: `RX divisor (${ends.rx})`, csvLabel: 'RX divisor', numeric: true, value: (r) => r.generators.rx?.divisor ?? null, text: (r) => divisorText(r.generators.rx?.divisor), width: 80 },
    { key: 'rxError', label: 'RX rate error', csvLabel: 'RX rate error (fraction)', numeric: true, value: (r) => r.generators.rx?.error ?? null, text: (r) => rateErrorText(r.generators.rx?.error), width: 58 },
  ]
}

/**
 * The standard rates worth a row: past the maximum rate, the rates whose margin is below
 * -1 UI are summed up in one line instead ("every rate above ... fails").
 */
export function splitStandardRates(rows: StandardRateRow[], maxBaud: number | null): { shown: StandardRateRow[]; hidden: StandardRateRow[] } {
  const cut = rows.findIndex((r) => !r.pass && (r.marginUi === null || r.marginUi < -1) && r.baud > (maxBaud ?? 0))
  return cut < 0 ? { shown: rows, hidden: [] } : { shown: rows.slice(0, cut), hidden: rows.slice(cut) }
}

/** A UART end's clock as the divisor column names it. */
export function endClockWords(clock: { min: number; max: number; generator: unknown } | undefined, clockHz: number | undefined): string {
  if (clock?.generator && clockHz) return formatEng(clockHz, 'Hz')
  return clock ? `±${formatPercent(Math.max(-clock.min, clock.max))}, no generator` : '–'
}

// ---------------------------------------------------------------- SPI

/** The SPI checks at the link's SCLK. */
export function spiCheckColumns(halfPeriod: number, t?: ReadingThresholds): ReportColumn<SpiCheck>[] {
  const state = (c: SpiCheck) => spiSlackState(c.slack, c.required, halfPeriod, t)
  return [
    { key: 'id', label: 'Check', csvLabel: 'check', value: (c) => c.id, width: 70 },
    { key: 'slack', label: 'Slack', csvLabel: 'slack (s)', numeric: true, value: (c) => c.slack, text: (c) => s(c.slack), state, width: 60 },
    { key: 'fraction', label: 'of T/2', csvLabel: 'slack (fraction of half period)', numeric: true, value: (c) => c.slackFraction, text: (c) => formatPercent(c.slackFraction), width: 46 },
    { key: 'required', label: 'Required', csvLabel: 'required (s)', numeric: true, value: (c) => c.required, text: (c) => s(c.required), width: 56 },
    { key: 'state', label: 'State', value: (c) => MARGIN_LABEL[state(c)], state, width: 46 },
    { key: 'pass', label: 'Result', csvLabel: 'pass', value: (c) => c.pass, text: (c) => (c.pass ? 'pass' : 'fail'), state: (c) => (c.pass ? 'healthy' : 'broken'), width: 40, only: ['csv'] },
    { key: 'description', label: 'What is compared', csvLabel: 'description', value: (c) => c.description, width: 200 },
  ]
}

/** Candidate SCLK frequencies, fastest first. */
export function spiCandidateColumns(): ReportColumn<SpiCandidate>[] {
  return [
    { key: 'sclk', label: 'SCLK', csvLabel: 'SCLK (Hz)', numeric: true, value: (c) => c.sclkHz, text: (c) => formatEng(c.sclkHz, 'Hz', { digits: 4 }), width: 70 },
    { key: 'prescaler', label: 'Prescaler', csvLabel: 'prescaler', numeric: true, value: (c) => c.prescaler, text: (c) => (c.prescaler === null ? '–' : String(c.prescaler)), width: 56 },
    { key: 'slack', label: 'Worst slack', csvLabel: 'worst slack (s)', numeric: true, value: (c) => c.worstSlack, text: (c) => s(c.worstSlack), state: (c) => marginState(c.worstSlack), width: 70 },
    { key: 'check', label: 'Worst check', csvLabel: 'worst check', value: (c) => c.worstCheck, width: 80 },
    { key: 'pass', label: 'Result', csvLabel: 'pass', value: (c) => c.pass, text: (c) => (c.pass ? 'pass' : 'fail'), state: (c) => (c.pass ? 'healthy' : 'broken'), width: 50 },
  ]
}

// ---------------------------------------------------------------- stages

type StageRow = ChannelResult['stages'][number]

/** The stages of a channel as the engine read them, corner by corner. */
export function stageColumns(): ReportColumn<StageRow>[] {
  const pair = (a: number, b: number) => `${s(a)} / ${s(b)}`
  return [
    { key: 'index', label: '#', csvLabel: 'stage', numeric: true, value: (st) => st.index + 1, width: 18 },
    { key: 'name', label: 'Stage', csvLabel: 'name', value: (st) => st.name, width: 120 },
    { key: 'kind', label: 'Kind', csvLabel: 'kind', value: (st) => st.kind, text: (st) => `${st.kind}${st.inverting ? ', inverting' : ''}`, width: 80 },
    { key: 'inverting', label: 'Inverting', csvLabel: 'inverting', value: (st) => st.inverting, only: ['csv'] },
    { key: 'tplh', label: 'tPLH typ / max', csvLabel: 'tPLH typ (s)', numeric: true, value: (st) => st.tplh.typ, text: (st) => pair(st.tplh.typ, st.tplh.max), width: 100 },
    { key: 'tplhMin', label: 'tPLH min', csvLabel: 'tPLH min (s)', numeric: true, value: (st) => st.tplh.min, only: ['csv'] },
    { key: 'tplhMax', label: 'tPLH max', csvLabel: 'tPLH max (s)', numeric: true, value: (st) => st.tplh.max, only: ['csv'] },
    { key: 'tphl', label: 'tPHL typ / max', csvLabel: 'tPHL typ (s)', numeric: true, value: (st) => st.tphl.typ, text: (st) => pair(st.tphl.typ, st.tphl.max), width: 100 },
    { key: 'tphlMin', label: 'tPHL min', csvLabel: 'tPHL min (s)', numeric: true, value: (st) => st.tphl.min, only: ['csv'] },
    { key: 'tphlMax', label: 'tPHL max', csvLabel: 'tPHL max (s)', numeric: true, value: (st) => st.tphl.max, only: ['csv'] },
    { key: 'trtf', label: 'tr / tf max', csvLabel: 'tr max (s)', numeric: true, value: (st) => st.tr.max, text: (st) => pair(st.tr.max, st.tf.max), width: 100 },
    { key: 'tf', label: 'tf max', csvLabel: 'tf max (s)', numeric: true, value: (st) => st.tf.max, only: ['csv'] },
    { key: 'asymmetryMin', label: 'PWD min', csvLabel: 'asymmetry min (s)', numeric: true, value: (st) => st.asymmetry.min, only: ['csv'] },
    { key: 'asymmetry', label: 'PWD max', csvLabel: 'asymmetry max (s)', numeric: true, value: (st) => st.asymmetry.max, text: (st) => s(st.asymmetry.max), width: 62 },
  ]
}

// ---------------------------------------------------------------- pull-up sweep

/** A sweep row's state: the ratings come first, so a row past an absolute maximum never reads healthy. */
export function pullupRowState(r: PullupSweepRow, requiredUi: number, t?: ReadingThresholds): MarginState {
  if (!r.withinRatings) return 'broken'
  return uartMarginState(r.marginUi, requiredUi, t)
}

/** What a row is in a frozen sweep: the revision's own, the recommendation, a faster one. */
export type RowRole = (r: PullupSweepRow) => string

/** Pull-up sweep rows: status first (why a row is out), values, then the details. */
export function pullupColumns(requiredUi: number, opts: { rbe?: boolean; role?: RowRole; t?: ReadingThresholds } = {}): ReportColumn<PullupSweepRow>[] {
  const state = (r: PullupSweepRow) => pullupRowState(r, requiredUi, opts.t)
  const ohm = (v: number | null) => formatEng(v, 'Ω')
  return [
    {
      key: 'status',
      label: 'Status',
      csvLabel: 'feasible',
      value: (r) => r.feasible,
      text: (r) => (r.feasible ? 'feasible' : (r.reasons[0] ?? 'not feasible')),
      state: (r) => (r.feasible ? 'healthy' : r.withinRatings ? 'thin' : 'broken'),
      width: 110,
    },
    ...(opts.role ? [{ key: 'role', label: 'Row', value: (r: PullupSweepRow) => opts.role!(r), width: 80, only: ['screen', 'pdf'] as TableTarget[] }] : []),
    { key: 'rl', label: 'RL', csvLabel: 'RL (ohm)', numeric: true, value: (r) => r.rl, text: (r) => ohm(r.rl), width: 50 },
    ...(opts.rbe ? [{ key: 'rbe', label: 'RBE', csvLabel: 'RBE (ohm)', numeric: true, value: (r: PullupSweepRow) => r.rbe, text: (r: PullupSweepRow) => (r.rbe === null ? 'open' : ohm(r.rbe)), width: 50 }] : []),
    { key: 'rLed', label: 'LED resistor', csvLabel: 'LED resistor (ohm)', numeric: true, value: (r) => r.rLed, text: (r) => ohm(r.rLed), width: 56 },
    { key: 'ledCurrent', label: 'IF', csvLabel: 'LED current (A)', numeric: true, value: (r) => r.ledCurrent, text: (r) => formatEng(r.ledCurrent, 'A'), width: 50 },
    { key: 'tplh', label: 'tPLH', csvLabel: 'tPLH (s)', numeric: true, value: (r) => r.tplh, text: (r) => s(r.tplh), width: 50 },
    { key: 'tr', label: 'tr', csvLabel: 'tr (s)', numeric: true, value: (r) => r.tr, text: (r) => s(r.tr), width: 50 },
    {
      key: 'margin',
      label: 'Margin',
      csvLabel: 'margin (UI)',
      numeric: true,
      value: (r) => r.marginUi,
      text: (r) => (r.withinRatings ? `${formatUi(r.marginUi)} ${MARGIN_LABEL[state(r)]}` : `${formatUi(r.marginUi)} (infeasible)`),
      state,
      width: 76,
    },
    { key: 'maxBaud', label: 'Max baud', csvLabel: 'max baud (Bd)', numeric: true, value: (r) => r.maxBaud, text: (r) => formatEng(r.maxBaud, 'Bd'), width: 56 },
    { key: 'withinRatings', label: 'Within ratings', csvLabel: 'within ratings', value: (r) => r.withinRatings, only: ['csv'] },
    { key: 'meetsTarget', label: 'Meets target', csvLabel: 'meets target', value: (r) => r.meetsTarget, only: ['csv'] },
    { key: 'ic', label: 'IC needed', csvLabel: 'collector current (A)', numeric: true, value: (r) => r.ic, text: (r) => formatEng(r.ic, 'A'), detail: true, only: ['screen', 'csv'] },
    { key: 'overdrive', label: 'Overdrive', csvLabel: 'overdrive', numeric: true, value: (r) => r.overdrive, text: (r) => `${r.overdrive.toFixed(2)}×`, detail: true, only: ['screen', 'csv'] },
    { key: 'power', label: 'Coupler power', csvLabel: 'power (W)', numeric: true, value: (r) => r.power, text: (r) => formatEng(r.power, 'W'), detail: true, only: ['screen', 'csv'] },
    { key: 'tphl', label: 'tPHL', csvLabel: 'tPHL (s)', numeric: true, value: (r) => r.tphl, text: (r) => s(r.tphl), detail: true, only: ['screen', 'csv'] },
    { key: 'tf', label: 'tf', csvLabel: 'tf (s)', numeric: true, value: (r) => r.tf, text: (r) => s(r.tf), detail: true, only: ['screen', 'csv'] },
    { key: 'reasons', label: 'Why not', csvLabel: 'reasons', value: (r) => r.reasons.join('; '), text: (r) => r.reasons.join('; ') || '–', detail: true, only: ['screen', 'csv'] },
    { key: 'notes', label: 'Notes', csvLabel: 'notes', value: (r) => r.notes.join('; '), text: (r) => r.notes.join('; ') || '–', detail: true, only: ['screen', 'csv'] },
  ]
}

// ---------------------------------------------------------------- I2C, CAN, RS-485 (timing-model.md section 4)

/** The text of a bus check's value, limit or slack in its unit. */
const busValue = (c: BusCheck, v: number) => (c.unit === 'fraction' ? formatPercent(v, 3) : s(v))

/** Timing checks of a bus link (I2C, CAN, RS-485 turnaround), each against its limit. */
export function busCheckColumns(): ReportColumn<BusCheck>[] {
  const state = (c: BusCheck): MarginState => (c.pass ? 'healthy' : 'broken')
  return [
    { key: 'id', label: 'Check', csvLabel: 'check', value: (c) => c.id, width: 70 },
    { key: 'value', label: 'Value', csvLabel: 'value (s, or fraction)', numeric: true, value: (c) => c.value, text: (c) => busValue(c, c.value), width: 56 },
    { key: 'limit', label: 'Limit', csvLabel: 'limit (s, or fraction)', numeric: true, value: (c) => c.limit, text: (c) => `${c.kind === 'min' ? '≥ ' : '≤ '}${busValue(c, c.limit)}`, width: 60 },
    { key: 'slack', label: 'Slack', csvLabel: 'slack (s, or fraction)', numeric: true, value: (c) => c.slack, text: (c) => busValue(c, c.slack), state, width: 56 },
    { key: 'pass', label: 'Result', csvLabel: 'pass', value: (c) => c.pass, text: (c) => (c.pass ? 'pass' : 'fail'), state, width: 36 },
    { key: 'label', label: 'What is compared', csvLabel: 'description', value: (c) => c.label, width: 220 },
  ]
}

type I2cLevelCheck = I2cLinkResult['levelChecks'][number]

/** The I2C level checks (pull-up against Rp(min), bus capacitance, the isolator's low offset). */
export function i2cLevelColumns(): ReportColumn<I2cLevelCheck>[] {
  const state = (c: I2cLevelCheck): MarginState => (c.pass ? 'healthy' : 'broken')
  return [
    { key: 'id', label: 'Check', csvLabel: 'check', value: (c) => c.id, width: 80 },
    { key: 'side', label: 'Side', csvLabel: 'side', value: (c) => c.side, width: 50 },
    { key: 'value', label: 'Value', csvLabel: 'value (SI)', numeric: true, value: (c) => c.value, text: (c) => formatEng(c.value, c.unit), width: 56 },
    { key: 'limit', label: 'Limit', csvLabel: 'limit (SI)', numeric: true, value: (c) => c.limit, text: (c) => formatEng(c.limit, c.unit), width: 56 },
    { key: 'pass', label: 'Result', csvLabel: 'pass', value: (c) => c.pass, text: (c) => (c.pass ? 'pass' : 'fail'), state, width: 36 },
    { key: 'label', label: 'What is compared', csvLabel: 'description', value: (c) => c.label, width: 200 },
  ]
}

type I2cPullupRow = I2cLinkResult['pullupSweep'][number]['rows'][number]

/** One side's pull-up sweep: each E-series value, its rise and the highest SCL it allows. */
export function i2cPullupColumns(): ReportColumn<I2cPullupRow>[] {
  const ok = (r: I2cPullupRow) => r.rpOk && r.riseOk && r.fallOk
  return [
    { key: 'rp', label: 'Rp', csvLabel: 'Rp (ohm)', numeric: true, value: (r) => r.rp, text: (r) => `${formatEng(r.rp, 'Ω')}${r.current ? ' (now)' : ''}`, width: 60 },
    { key: 'rise', label: 'Rise 30-70 %', csvLabel: 'rise (s)', numeric: true, value: (r) => r.rise, text: (r) => s(r.rise), state: (r) => (r.riseOk ? 'healthy' : 'broken'), width: 60 },
    { key: 'fall', label: 'Fall 70-30 %', csvLabel: 'fall (s)', numeric: true, value: (r) => r.fall, text: (r) => (r.fall === null ? 'none' : s(r.fall)), state: (r) => (r.fallOk ? 'healthy' : 'broken'), width: 60 },
    { key: 'rpOk', label: 'Above Rp(min)', csvLabel: 'above Rp(min)', value: (r) => r.rpOk, text: (r) => (r.rpOk ? 'yes' : 'no'), state: (r) => (r.rpOk ? 'healthy' : 'broken'), width: 70 },
    { key: 'maxScl', label: 'Highest SCL', csvLabel: 'highest SCL (Hz)', numeric: true, value: (r) => r.maxSclHz, text: (r) => (r.maxSclHz === null ? '–' : formatEng(r.maxSclHz, 'Hz')), state: (r) => (ok(r) ? 'healthy' : 'broken'), width: 60 },
  ]
}

/** The CAN bit-timing table: every setting of the clock for the bit rate. */
export function canTimingColumns(): ReportColumn<CanBitTimingRow>[] {
  return [
    { key: 'brp', label: 'BRP', csvLabel: 'brp', numeric: true, value: (r) => r.brp, width: 30 },
    { key: 'tq', label: 'tq', csvLabel: 'tq (s)', numeric: true, value: (r) => r.tq, text: (r) => s(r.tq), width: 44 },
    { key: 'tqPerBit', label: 'tq/bit', csvLabel: 'tq per bit', numeric: true, value: (r) => r.tqPerBit, width: 34 },
    { key: 'propSeg', label: 'Prop', csvLabel: 'Prop_Seg (tq)', numeric: true, value: (r) => r.propSeg, width: 30 },
    { key: 'phaseSeg1', label: 'Phase 1', csvLabel: 'Phase_Seg1 (tq)', numeric: true, value: (r) => r.phaseSeg1, width: 36 },
    { key: 'phaseSeg2', label: 'Phase 2', csvLabel: 'Phase_Seg2 (tq)', numeric: true, value: (r) => r.phaseSeg2, width: 36 },
    { key: 'sjw', label: 'SJW', csvLabel: 'SJW (tq)', numeric: true, value: (r) => r.sjw, width: 28 },
    { key: 'samplePoint', label: 'Sample point', csvLabel: 'sample point (fraction)', numeric: true, value: (r) => r.samplePoint, text: (r) => formatPercent(r.samplePoint), width: 46 },
    { key: 'tolerance', label: 'Clock tolerance', csvLabel: 'oscillator tolerance (fraction)', numeric: true, value: (r) => r.tolerance, text: (r) => formatPercent(r.tolerance, 3), width: 50 },
    { key: 'loop', label: 'Loop delay fits', csvLabel: 'loop delay fits', value: (r) => r.loopDelayFits, text: (r) => (r.loopDelayFits ? 'yes' : 'no'), state: (r) => (r.loopDelayFits ? 'healthy' : 'broken'), width: 44 },
    { key: 'maxLength', label: 'Longest bus', csvLabel: 'longest bus (m)', numeric: true, value: (r) => r.maxLength, text: (r) => (r.maxLength === null ? 'none' : formatEng(r.maxLength, 'm')), width: 50 },
  ]
}

type CanLengthRow = CanLinkResult['lengthByRate'][number]

/** The longest bus at each common bit rate. */
export function canLengthColumns(): ReportColumn<CanLengthRow>[] {
  return [
    { key: 'bitRate', label: 'Bit rate', csvLabel: 'bit rate (bit/s)', numeric: true, value: (r) => r.bitRate, text: (r) => formatEng(r.bitRate, 'bit/s'), width: 60 },
    { key: 'maxBusLength', label: 'Longest bus', csvLabel: 'longest bus (m)', numeric: true, value: (r) => r.maxBusLength, text: (r) => (r.maxBusLength === null ? 'none (no setting of this clock)' : formatEng(r.maxBusLength, 'm')), width: 80 },
  ]
}
