/**
 * UART per-bit margin against the sampling point (timing-model.md section 2).
 *
 * Receiver model: a tick clock of N ticks per receiver bit T_rx. The start bit is
 * detected at the first tick at or after the falling edge arrives (detection latency in
 * [0, T_rx/N)); bit k (k = 0 the start bit) is sampled at ticks k*N + s_j after the
 * detection tick. Vote: `single` (one tick), `majority` (the median tick decides both
 * sides), `all` (the first tick decides the early side, the last the late side). The
 * `ideal` sampler samples at (k + samplePoint) * T_rx with no latency.
 *
 * Received edges, relative to the arrival of the start bit's falling edge (the receiver
 * re-times on it, so a common delay cancels): boundary j (the start of bit j) arrives at
 * j*T_tx if its edge falls, j*T_tx + (D_rise - D_fall) if it rises, each +- the peak
 * jitter of that edge and of the sync edge. Directions are logical (after the
 * receiver's invert).
 *
 * Margins: a bit is valid from the transition that starts its run of equal bits to the
 * transition that ends it (no transition at a boundary: no risk there; an idle line
 * after the stop bit: no end). Early margin = earliest critical sample - latest start of
 * the run; late margin = earliest end of the run - latest critical sample; each the
 * worst over detection latency, both clocks' error intervals, the PWD interval and
 * jitter. Every term is linear in those quantities, so the worst case sits at their
 * interval ends and is written in closed form; the worst over all 2^n data patterns
 * (parity following) depends only on where each bit's run starts and ends and in which
 * direction, so the frame's patterns are enumerated once per frame format into those
 * cases.
 *
 * In closed form every case's margin in UI is A - baud * b, with A fixed by the frame,
 * the sampler and the clock error fractions and b >= 0 the distortion (asymmetry and
 * jitter, seconds). So the margin in UI never rises with baud, the maximum baud has a
 * closed form, and the clock tolerance follows from one linear inequality per case.
 */
import type { UartSettings } from '../../shared/schemas/link'
import { formatEng } from '../../shared/utils/units'
import { bitTimeBounds, rateErrorBounds, statedErrorBounds, type BaudGeneratorResult, type ClockSpec, type RateErrorBounds } from './clock'
import { EngineInputError } from './errors'
import { gaussianTail, qFromBer, totalJitter } from './statistics'
import type { Warning } from './types'
import type { Parity, Vote, SamplerModel, LimitedBy, Distortion, ClockErrors, MarginLosses, UartBitResult, MaxBaudResult, ClockTolerance, StandardRateRow, BerEstimate, PulseCheck, UartChannelResult } from '../../shared/types/analysis'
export type { Parity, Vote, SamplerModel, LimitedBy, Distortion, ClockErrors, MarginLosses, UartBitResult, MaxBaudResult, ClockTolerance, StandardRateRow, BerEstimate, PulseCheck, UartChannelResult }

// ------------------------------------------------------------------ frame


/** One way a bit's run can start (early side) or end (late side), with a data value that produces it. */
export interface FrameCase {
  /** bit index (0 = start bit) */
  bit: number
  /** position of the boundary in transmitter bit times from the start edge (the start of bit `pos`; the next start edge at the frame length) */
  pos: number
  /** the logical edge at that boundary rises */
  rising: boolean
  /** the boundary is the start bit's own falling edge (the sync edge) */
  sync: boolean
  /** smallest data value that produces this case */
  pattern: number
}

export interface FrameLayout {
  dataBits: number
  parity: Parity
  stopBits: number
  backToBack: boolean
  /** labels of the sampled bits: start, d0.., parity, stop */
  labels: string[]
  /** frame length in bit times (start + data + parity + stop bits) */
  frameBits: number
  early: FrameCase[][]
  late: FrameCase[][]
  /** per bit: some data value leaves its run without an end (idle line after the stop bit) */
  lateUnbounded: boolean[]
}

const layoutCache = new Map<string, FrameLayout>()

/** The parity bit that follows from a data value. */
export function parityBit(parity: Parity, value: number): number | null {
  if (parity === 'none') return null
  if (parity === 'mark') return 1
  if (parity === 'space') return 0
  let ones = 0
  for (let v = value; v; v >>>= 1) ones += v & 1
  return parity === 'even' ? ones & 1 : 1 - (ones & 1)
}

/**
 * The frame's bits for one data value: start (0), data LSB first, parity, first stop (1).
 * Only the sampled bits; the frame length is in FrameLayout.frameBits.
 */
export function frameBits(dataBits: number, parity: Parity, value: number): number[] {
  const bits = [0]
  for (let i = 0; i < dataBits; i++) bits.push((value >>> i) & 1)
  const p = parityBit(parity, value)
  if (p !== null) bits.push(p)
  bits.push(1)
  return bits
}

/** Enumerate every data value of a frame format into each bit's run-start and run-end cases (cached). */
export function frameLayout(dataBits: number, parity: Parity, stopBits: number, backToBack: boolean): FrameLayout {
  const key = `${dataBits}|${parity}|${stopBits}|${backToBack}`
  const hit = layoutCache.get(key)
  if (hit) return hit
  const labels = ['start', ...Array.from({ length: dataBits }, (_, i) => `d${i}`), ...(parity === 'none' ? [] : ['parity']), 'stop']
  const K = labels.length - 1
  const frameLen = 1 + dataBits + (parity === 'none' ? 0 : 1) + stopBits
  const early: Map<string, FrameCase>[] = labels.map(() => new Map())
  const late: Map<string, FrameCase>[] = labels.map(() => new Map())
  const lateUnbounded = labels.map(() => false)
  for (let v = 0; v < 1 << dataBits; v++) {
    const b = frameBits(dataBits, parity, v)
    for (let k = 0; k <= K; k++) {
      let a = k
      while (a > 0 && b[a - 1] === b[k]) a--
      const rising = b[k] === 1
      const ek = `${a}|${b[k]}`
      if (!early[k]!.has(ek)) early[k]!.set(ek, { bit: k, pos: a, rising: a > 0 && rising, sync: a === 0, pattern: v })
      let e = k + 1
      while (e <= K && b[e] === b[k]) e++
      if (e <= K) {
        if (!late[k]!.has(`${e}|${b[k]}`)) late[k]!.set(`${e}|${b[k]}`, { bit: k, pos: e, rising: b[k] === 0, sync: false, pattern: v })
      } else if (backToBack) {
        // the run reaches the stop bit and ends at the next frame's start edge (falling)
        if (!late[k]!.has('next')) late[k]!.set('next', { bit: k, pos: frameLen, rising: false, sync: false, pattern: v })
      } else lateUnbounded[k] = true
    }
  }
  const layout: FrameLayout = {
    dataBits,
    parity,
    stopBits,
    backToBack,
    labels,
    frameBits: frameLen,
    early: early.map((m) => [...m.values()]),
    late: late.map((m) => [...m.values()]),
    lateUnbounded,
  }
  layoutCache.set(key, layout)
  return layout
}

// ------------------------------------------------------------------ sampler


/** Receiver-side settings of one direction (the rx of the first uart channel, or the tx end for the second). */
export interface ReceiverEnd extends ClockSpec {
  sampler: 'ticks' | 'ideal'
  oversampling: number
  sampleTicks?: number[]
  vote: Vote
  samplePoint: number
}

/** Transmitter-side settings of one direction. */
export interface TransmitterEnd extends ClockSpec {
  oversampling?: number
}


/** Default sample ticks after the detection tick: the middle tick and, for a vote, its neighbours (16x: 7, 8, 9; 8x: 3, 4, 5). */
export function defaultSampleTicks(oversampling: number, vote: Vote): number[] {
  const c = Math.floor(oversampling / 2)
  return vote === 'single' ? [c] : [c - 1, c, c + 1]
}

/** Reduce a receiver's sampling scheme to its critical sample positions. */
export function samplerModel(rx: ReceiverEnd, path: (string | number)[] = ['uart', 'rx']): SamplerModel {
  if (rx.sampler === 'ideal')
    return { kind: 'ideal', oversampling: null, ticks: null, vote: null, early: rx.samplePoint, late: rx.samplePoint, latency: 0 }
  const n = rx.oversampling
  const ticks = rx.sampleTicks && rx.sampleTicks.length ? [...rx.sampleTicks] : defaultSampleTicks(n, rx.vote)
  if (ticks.some((t, i) => !Number.isInteger(t) || t < 0 || t >= n || (i > 0 && t <= ticks[i - 1]!)))
    throw new EngineInputError([...path, 'sampleTicks'], 'sample ticks must be strictly increasing integers below the oversampling')
  if (rx.vote === 'single' && ticks.length !== 1) throw new EngineInputError([...path, 'sampleTicks'], "vote 'single' takes exactly one tick")
  if (rx.vote === 'majority' && (ticks.length < 3 || ticks.length % 2 === 0))
    throw new EngineInputError([...path, 'sampleTicks'], "vote 'majority' takes an odd number of at least three ticks")
  const median = ticks[(ticks.length - 1) >> 1]!
  const first = rx.vote === 'majority' ? median : ticks[0]!
  const last = rx.vote === 'majority' ? median : ticks[ticks.length - 1]!
  return { kind: 'ticks', oversampling: n, ticks, vote: rx.vote, early: first / n, late: last / n, latency: 1 / n }
}

// ------------------------------------------------------------------ margins




interface CaseTerms {
  /** the UI-invariant part of the margin, UI */
  A: number
  /** the distortion part, seconds (margin = A * T - b) */
  b: number
}

/**
 * The asymmetry a systematic PWD can cost a case: rising run starts arrive up to
 * max(PWD max, 0) late, rising run ends up to -min(PWD min, 0) early. An asymmetry is
 * never credited as a benefit (see the assumptions).
 */
function asymmetryLoss(c: FrameCase, side: 'early' | 'late', d: Distortion): number {
  if (!c.rising) return 0
  return side === 'early' ? Math.max(d.pwd.max, 0) : -Math.min(d.pwd.min, 0)
}

function jitterLoss(c: FrameCase, side: 'early' | 'late', d: Distortion): number {
  return side === 'early' && c.sync ? 0 : 2 * d.jitterPeak
}

function caseTerms(c: FrameCase, side: 'early' | 'late', s: SamplerModel, d: Distortion, e: ClockErrors): CaseTerms {
  const b = asymmetryLoss(c, side, d) + jitterLoss(c, side, d)
  if (side === 'early') return { A: (c.bit + s.early) / (1 + e.rx.max) - c.pos / (1 + e.tx.min), b }
  return { A: c.pos / (1 + e.tx.max) - (c.bit + s.late + s.latency) / (1 + e.rx.min), b }
}



function losses(c: FrameCase, side: 'early' | 'late', s: SamplerModel, d: Distortion, e: ClockErrors, T: number): MarginLosses {
  const txT = bitTimeBounds(e.tx, 1 / T)
  const rxT = bitTimeBounds(e.rx, 1 / T)
  if (side === 'early') {
    const cE = c.bit + s.early
    return {
      sampling: (0.5 - s.early) * T,
      clock: cE * (T - rxT.min) + c.pos * (txT.max - T),
      asymmetry: asymmetryLoss(c, side, d),
      jitter: jitterLoss(c, side, d),
    }
  }
  const cL = c.bit + s.late + s.latency
  return {
    sampling: (s.late + s.latency - 0.5) * T,
    clock: cL * (rxT.max - T) + c.pos * (T - txT.min),
    asymmetry: asymmetryLoss(c, side, d),
    jitter: jitterLoss(c, side, d),
  }
}

function largestLoss(l: MarginLosses): LimitedBy {
  let best: LimitedBy = 'sampling'
  let v = l.sampling
  for (const k of ['clock', 'asymmetry', 'jitter'] as const)
    if (l[k] > v) {
      v = l[k]
      best = k
    }
  return best
}

/** Per-bit margins of a frame at `baud` (timing-model.md section 2, "Margins"). */
export function bitMargins(layout: FrameLayout, s: SamplerModel, d: Distortion, e: ClockErrors, baud: number): UartBitResult[] {
  const T = 1 / baud
  const txT = bitTimeBounds(e.tx, baud)
  const rxT = bitTimeBounds(e.rx, baud)
  return layout.labels.map((label, k) => {
    let early = Infinity
    let earlyCase: FrameCase | null = null
    for (const c of layout.early[k]!) {
      const t = caseTerms(c, 'early', s, d, e)
      const m = t.A * T - t.b
      if (m < early) {
        early = m
        earlyCase = c
      }
    }
    let late = Infinity
    let lateCase: FrameCase | null = null
    for (const c of layout.late[k]!) {
      const t = caseTerms(c, 'late', s, d, e)
      const m = t.A * T - t.b
      if (m < late) {
        late = m
        lateCase = c
      }
    }
    const ec = earlyCase!
    const side: 'early' | 'late' = lateCase && late < early ? 'late' : 'early'
    const worst = side === 'late' ? lateCase! : ec
    const margin = side === 'late' ? late : early
    const l = losses(worst, side, s, d, e, T)
    return {
      index: k,
      label,
      earlyMargin: early,
      lateMargin: lateCase ? late : null,
      margin,
      marginUi: margin / T,
      earlyMarginUi: early / T,
      lateMarginUi: lateCase ? late / T : null,
      worstPattern: worst.pattern,
      earlyPattern: ec.pattern,
      latePattern: lateCase ? lateCase.pattern : null,
      side,
      limitedBy: largestLoss(l),
      losses: l,
      samples: { earliest: (k + s.early) * rxT.min, latest: (k + s.late + s.latency) * rxT.max },
      validFrom: ec.pos * txT.max + asymmetryLoss(ec, 'early', d) + jitterLoss(ec, 'early', d),
      validTo: lateCase
        ? lateCase.pos * txT.min - asymmetryLoss(lateCase, 'late', d) - jitterLoss(lateCase, 'late', d)
        : null,
    }
  })
}

/**
 * Every case of a frame flattened for repeated evaluation: margin(UI) = A - baud * b with
 * A = p / (1 + rx.max) - q / (1 + tx.min) (early) or q / (1 + tx.max) - p / (1 + rx.min) (late),
 * p the deciding sample's position (receiver bits), q the boundary's (transmitter bits).
 */
export interface CaseTable {
  p: Float64Array
  q: Float64Array
  /** 1 early, 0 late */
  early: Uint8Array
  b: Float64Array
}

export function caseTable(layout: FrameLayout, s: SamplerModel, d: Distortion): CaseTable {
  let n = 0
  for (let k = 0; k < layout.labels.length; k++) n += layout.early[k]!.length + layout.late[k]!.length
  const t: CaseTable = { p: new Float64Array(n), q: new Float64Array(n), early: new Uint8Array(n), b: new Float64Array(n) }
  let i = 0
  for (let k = 0; k < layout.labels.length; k++)
    for (const side of ['early', 'late'] as const)
      for (const c of side === 'early' ? layout.early[k]! : layout.late[k]!) {
        t.p[i] = side === 'early' ? c.bit + s.early : c.bit + s.late + s.latency
        t.q[i] = c.pos
        t.early[i] = side === 'early' ? 1 : 0
        t.b[i++] = asymmetryLoss(c, side, d) + jitterLoss(c, side, d)
      }
  return t
}

/** Worst margin of the whole frame in UI at `baud` with clock errors `e`, from a case table. */
export function tableWorstUi(t: CaseTable, e: ClockErrors, baud: number): number {
  const rxHi = 1 / (1 + e.rx.max)
  const rxLo = 1 / (1 + e.rx.min)
  const txHi = 1 / (1 + e.tx.max)
  const txLo = 1 / (1 + e.tx.min)
  let worst = Infinity
  const { p, q, early, b } = t
  for (let i = 0; i < p.length; i++) {
    const A = early[i] ? p[i]! * rxHi - q[i]! * txLo : q[i]! * txHi - p[i]! * rxLo
    const m = A - baud * b[i]!
    if (m < worst) worst = m
  }
  return worst
}

/** Worst margin of the whole frame in UI at `baud`, from the closed form (no per-bit detail). */
export function worstMarginUi(layout: FrameLayout, s: SamplerModel, d: Distortion, e: ClockErrors, baud: number): number {
  return tableWorstUi(caseTable(layout, s, d), e, baud)
}

/**
 * The other way round from CaseTable: every case of a frame with the sampler and the
 * clock error fractions fixed, for evaluating many distortions (the pull-up sweep
 * changes only the swept channel's chain from row to row). Each case's UI-invariant
 * part A is computed once, in both roundings the closed forms use: `aTable` as
 * tableWorstUi forms it (p times the reciprocal rate factor), `aSearch` as maxBaud
 * forms it (p divided by the rate factor), so results stay bit for bit the same.
 */
export interface FixedClockCases {
  aTable: Float64Array
  aSearch: Float64Array
  /** 1 early side, 0 late side */
  early: Uint8Array
  /** 1 when the case's boundary edge rises (an asymmetry can cost it) */
  rising: Uint8Array
  /** 1 when the boundary is the sync edge (no jitter against itself) */
  sync: Uint8Array
}

const ZERO_DISTORTION: Distortion = { pwd: { min: 0, max: 0 }, jitterPeak: 0, jitterRms: 0 }

/**
 * @param e the clock error intervals the margins use (`aTable`)
 * @param eSearch the ones the maximum-baud search uses (`aSearch`; default `e`): each end's stated bound
 */
export function fixedClockCases(layout: FrameLayout, s: SamplerModel, e: ClockErrors, eSearch: ClockErrors = e): FixedClockCases {
  let n = 0
  for (let k = 0; k < layout.labels.length; k++) n += layout.early[k]!.length + layout.late[k]!.length
  const t: FixedClockCases = {
    aTable: new Float64Array(n),
    aSearch: new Float64Array(n),
    early: new Uint8Array(n),
    rising: new Uint8Array(n),
    sync: new Uint8Array(n),
  }
  const rxHi = 1 / (1 + e.rx.max)
  const rxLo = 1 / (1 + e.rx.min)
  const txHi = 1 / (1 + e.tx.max)
  const txLo = 1 / (1 + e.tx.min)
  let i = 0
  for (let k = 0; k < layout.labels.length; k++)
    for (const side of ['early', 'late'] as const)
      for (const c of side === 'early' ? layout.early[k]! : layout.late[k]!) {
        const p = side === 'early' ? c.bit + s.early : c.bit + s.late + s.latency
        t.aTable[i] = side === 'early' ? p * rxHi - c.pos * txLo : c.pos * txHi - p * rxLo
        t.aSearch[i] = caseTerms(c, side, s, ZERO_DISTORTION, eSearch).A
        t.early[i] = side === 'early' ? 1 : 0
        t.rising[i] = c.rising ? 1 : 0
        t.sync[i++] = c.sync ? 1 : 0
      }
  return t
}

/**
 * tableWorstUi at the clocks `fixed` was built for, from the same frame's case table:
 * only the baud varies (the rate sweep), so each case's clock part is not recomputed.
 */
export function fixedClockWorstUi(fixed: FixedClockCases, t: CaseTable, baud: number): number {
  const { aTable } = fixed
  const { b } = t
  let worst = Infinity
  for (let i = 0; i < aTable.length; i++) {
    const m = aTable[i]! - baud * b[i]!
    if (m < worst) worst = m
  }
  return worst
}

/** Worst margin and maximum baud of one distortion: what marginAndMaxBaud writes. */
export interface MarginAndMaxBaud {
  /** worstMarginUi at the given baud */
  worstUi: number
  /** maxBaud(...).maxBaud: the highest baud meeting the required margin, the cap, or null */
  maxBaud: number | null
}

/**
 * worstMarginUi and maxBaud's rate for one distortion in a single pass over the cases,
 * written into `out` (nothing allocated). Each case's distortion part b is the
 * asymmetry a rising boundary can cost on its side plus the peak jitter of the edge and
 * of the sync edge (none on the sync edge's own early side), as in caseTable.
 */
export function marginAndMaxBaud(
  t: FixedClockCases,
  d: Distortion,
  baud: number,
  requiredUi: number,
  cap: number,
  out: MarginAndMaxBaud,
): MarginAndMaxBaud {
  const startLoss = Math.max(d.pwd.max, 0) // a rising run start arrives late
  const endLoss = -Math.min(d.pwd.min, 0) // a rising run end arrives early
  const jitter = 2 * d.jitterPeak
  const { aTable, aSearch, early, rising, sync } = t
  let worst = Infinity
  let limit = Infinity
  let passes = true
  for (let i = 0; i < aTable.length; i++) {
    const isEarly = early[i] === 1
    const b = (rising[i] ? (isEarly ? startLoss : endLoss) : 0) + (isEarly && sync[i] ? 0 : jitter)
    const m = aTable[i]! - baud * b
    if (m < worst) worst = m
    if (!passes) continue
    // maximum baud: A - baud * b >= requiredUi for every case
    const A = aSearch[i]!
    if (b <= 0) {
      if (A < requiredUi) passes = false
    } else if (A <= requiredUi) passes = false
    else {
      const r = (A - requiredUi) / b
      if (r < limit) limit = r
    }
  }
  out.worstUi = worst
  out.maxBaud = !passes ? null : limit >= cap ? cap : limit
  return out
}


/**
 * Maximum baud meeting `requiredUi` with the clock error fractions held fixed: every
 * case requires A - baud * b >= requiredUi, so baud <= (A - requiredUi) / b for b > 0;
 * a case with b = 0 passes at every rate or at none.
 */
export function maxBaud(layout: FrameLayout, s: SamplerModel, d: Distortion, e: ClockErrors, requiredUi: number, cap: number): MaxBaudResult {
  let limit = Infinity
  let limiting: { index: number; label: string; side: 'early' | 'late' } | null = null
  for (let k = 0; k < layout.labels.length; k++)
    for (const side of ['early', 'late'] as const)
      for (const c of side === 'early' ? layout.early[k]! : layout.late[k]!) {
        const t = caseTerms(c, side, s, d, e)
        const where = { index: k, label: layout.labels[k]!, side }
        if (t.b <= 0) {
          if (t.A < requiredUi)
            return {
              maxBaud: null,
              cap,
              capped: false,
              limitedBy: where,
              note: `No rate meets the required margin: bit ${where.label} (${side} side) falls short at any baud, because of the clocks and the sampling point alone.`,
            }
          continue
        }
        if (t.A <= requiredUi)
          return {
            maxBaud: null,
            cap,
            capped: false,
            limitedBy: where,
            note: `No rate meets the required margin: bit ${where.label} (${side} side) falls short even at the lowest rates.`,
          }
        const b = (t.A - requiredUi) / t.b
        if (b < limit) {
          limit = b
          limiting = where
        }
      }
  if (limit >= cap)
    return {
      maxBaud: cap,
      cap,
      capped: true,
      limitedBy: null,
      note: `Distortion does not limit the rate up to the search cap of ${cap} baud; the cap is reported.`,
    }
  return {
    maxBaud: limit,
    cap,
    capped: false,
    limitedBy: limiting,
    note: `Limited by bit ${limiting!.label} (${limiting!.side} side).`,
  }
}


/**
 * The incoming-rate range the frame tolerates (clock errors of both ends set aside):
 * receiver exactly at `baud`, transmitter bit T/r. Early cases need
 * (bit + early) - pos / r >= requiredUi + b/T, late cases pos / r - (bit + late + latency)
 * >= requiredUi + b/T: each a bound on r.
 */
export function clockTolerance(layout: FrameLayout, s: SamplerModel, d: Distortion, baud: number, requiredUi: number): ClockTolerance {
  const none: ClockTolerance = { slowest: null, fastest: null, slowestBit: null, fastestBit: null }
  let slowest = 0
  let slowestBit: number | null = null
  let fastest = Infinity
  let fastestBit: number | null = null
  for (let k = 0; k < layout.labels.length; k++) {
    for (const c of layout.early[k]!) {
      const room = c.bit + s.early - requiredUi - baud * (asymmetryLoss(c, 'early', d) + jitterLoss(c, 'early', d))
      if (c.pos === 0) {
        if (room < 0) return none
        continue
      }
      if (room <= 0) return none
      const r = c.pos / room
      if (r > slowest) {
        slowest = r
        slowestBit = k
      }
    }
    for (const c of layout.late[k]!) {
      const need = c.bit + s.late + s.latency + requiredUi + baud * (asymmetryLoss(c, 'late', d) + jitterLoss(c, 'late', d))
      const r = c.pos / need
      if (r < fastest) {
        fastest = r
        fastestBit = k
      }
    }
  }
  if (!Number.isFinite(fastest) || slowest > fastest) return none
  return { slowest, fastest, slowestBit, fastestBit }
}

// ------------------------------------------------------------------ channel analysis

/** The usual UART rates, baud. */
export const STANDARD_BAUD_RATES = [
  1200, 2400, 4800, 9600, 14400, 19200, 28800, 38400, 57600, 76800, 115200, 230400, 250000, 460800, 500000, 921600, 1000000,
  1500000, 2000000, 3000000,
] as const

/** Highest baud the max-baud search reports: the schema's own limit. */
export const MAX_BAUD_CAP = 100e6





export interface UartChannelInput {
  channelId: string
  settings: Pick<UartSettings, 'baud' | 'dataBits' | 'parity' | 'stopBits' | 'backToBack' | 'requiredMarginUi' | 'berTarget'>
  tx: TransmitterEnd
  rx: ReceiverEnd
  /** chain distortion at the receiving pin, physical directions (pwdTyp / pwdSigma for the statistical view) */
  chain: { pwd: { min: number; max: number }; jitterPeak: number; jitterRms: number; pwdTyp?: number; pwdSigma?: number }
  /** the receiver inverts (logical edges are the opposite physical ones) */
  receiverInvert: boolean
  /** why the channel cannot carry data at all (inverted polarity, unreachable threshold, unsaturated output); absent or null when it can */
  notFunctional?: string | null
  /** the longest shortest-pulse any stage of the chain needs, seconds, with the stage's name */
  pulseLimit?: { seconds: number; stage: string } | null
  /** path of the settings in the link, for errors: ['uart'] */
  path?: (string | number)[]
  /** the rx / tx keys of this direction in the link, for error paths */
  rxKey?: 'rx' | 'tx'
  txKey?: 'rx' | 'tx'
}

const TX_DEFAULT_OVERSAMPLING = 16

/** Rate error bounds of both ends at `baud`. */
function clocksAt(input: UartChannelInput, baud: number): { tx: RateErrorBounds; rx: RateErrorBounds } {
  return {
    tx: rateErrorBounds(input.tx, baud, input.tx.oversampling ?? TX_DEFAULT_OVERSAMPLING),
    rx: rateErrorBounds(input.rx, baud, input.rx.oversampling),
  }
}

/** Why a generator cannot produce `baud`, or null when both can. */
function unreachableRate(clocks: { tx: RateErrorBounds; rx: RateErrorBounds }, baud: number): string | null {
  for (const [end, b] of [
    ['transmitter', clocks.tx],
    ['receiver', clocks.rx],
  ] as const)
    if (b.generator && !b.generator.reachable)
      return `the ${end}'s baud generator cannot produce ${formatEng(baud, 'Bd')}: it would need a divisor below 1 and runs at ${formatEng(b.generator.actualBaud, 'Bd')} (divisor 1) instead`
  return null
}

/**
 * A fractional divisor alternates the tick period between floor and ceil of the divisor,
 * so each sample lands up to one generator clock period off its even position: the
 * deciding samples widen by 1 / (N x divisor) receiver bits each way.
 */
function withFractionalSpread(s: SamplerModel, rx: RateErrorBounds): SamplerModel {
  const g = rx.generator
  if (s.kind !== 'ticks' || !g || !g.fractional || s.oversampling === null) return s
  const spread = 1 / (s.oversampling * g.divisor)
  return { ...s, early: s.early - spread, late: s.late + spread, fractionalSpread: spread }
}

/** The frame's shortest pulse against the chain's pulse limit at `baud` with the transmitter's fastest clock. */
function pulseCheckAt(input: UartChannelInput, d: Distortion, tx: RateErrorBounds, baud: number): PulseCheck | null {
  if (!input.pulseLimit) return null
  const shortest = 1 / (baud * (1 + tx.max)) - Math.max(Math.abs(d.pwd.min), Math.abs(d.pwd.max))
  return { stage: input.pulseLimit.stage, required: input.pulseLimit.seconds, shortest, pass: shortest >= input.pulseLimit.seconds }
}

/** Full UART analysis of one direction (timing-model.md section 2). */
/** Each end's stated error bound, rate-independent (the maximum-baud search and the rate sweep use it). */
export function statedClockErrors(tx: ClockSpec, rx: ClockSpec): ClockErrors {
  return { tx: statedErrorBounds(tx), rx: statedErrorBounds(rx) }
}

export function analyzeUartChannel(input: UartChannelInput): UartChannelResult {
  const set = input.settings
  const path = input.path ?? ['uart']
  const layout = frameLayout(set.dataBits, set.parity, set.stopBits, set.backToBack)
  const clocks = clocksAt(input, set.baud)
  const sampler = withFractionalSpread(samplerModel(input.rx, [...path, input.rxKey ?? 'rx']), clocks.rx)
  const pwd = input.receiverInvert ? { min: -input.chain.pwd.max, max: -input.chain.pwd.min } : { ...input.chain.pwd }
  const distortion: Distortion = { pwd, jitterPeak: input.chain.jitterPeak, jitterRms: input.chain.jitterRms }
  const errors: ClockErrors = { tx: clocks.tx, rx: clocks.rx }
  const T = 1 / set.baud
  const req = set.requiredMarginUi
  const warnings = generatorWarnings(input.channelId, clocks, set.baud)
  const functional = !input.notFunctional
  const pulseCheck = pulseCheckAt(input, distortion, clocks.tx, set.baud)
  const unreachable = unreachableRate(clocks, set.baud)
  const noMarginReason = !functional
    ? `the channel cannot carry data: ${input.notFunctional}`
    : unreachable
      ? unreachable
      : pulseCheck && !pulseCheck.pass
        ? `a bit of ${formatEng(pulseCheck.shortest, 's')} (after the chain's asymmetry) is shorter than the ${formatEng(pulseCheck.required, 's')} stage '${pulseCheck.stage}' passes: pulses are lost`
        : null
  if (unreachable) warnings.push({ code: 'generator-error', channel: input.channelId, message: `${capitalise(unreachable)}.` })
  if (pulseCheck && !pulseCheck.pass && functional && !unreachable)
    warnings.push({ code: 'no-pass', channel: input.channelId, message: `${capitalise(noMarginReason!)}.` })

  const bits = noMarginReason === null ? bitMargins(layout, sampler, distortion, errors, set.baud) : []
  let worstBit: number | null = bits.length ? 0 : null
  for (const b of bits) if (b.marginUi < bits[worstBit!]!.marginUi) worstBit = b.index
  const worstUi = worstBit === null ? null : bits[worstBit]!.marginUi
  const verdict: UartChannelResult['verdict'] = worstUi === null ? 'fail' : worstUi >= req ? 'pass' : worstUi >= 0 ? 'marginal' : 'fail'

  const search = functional ? maxBaudSearch(input, layout, sampler, distortion, req) : null
  if (search?.capped) warnings.push({ code: 'rate-cap', channel: input.channelId, message: search.note })
  if (search && search.maxBaud === null) warnings.push({ code: 'no-pass', channel: input.channelId, message: search.note })
  const table = caseTable(layout, sampler, distortion)
  const rateSweep = functional && search ? sweepRates(input, layout, sampler, table, search.maxBaud, search.cap) : []
  const standardRates = standardRateRows(input, table, distortion, functional)
  const fastest = standardRates.filter((r) => r.pass).pop()

  let statistical: UartChannelResult['statistical'] = null
  if (noMarginReason === null && input.chain.pwdTyp !== undefined && input.chain.pwdSigma !== undefined) {
    const lo = Math.max(input.chain.pwd.min, input.chain.pwdTyp - 3 * input.chain.pwdSigma)
    const hi = Math.min(input.chain.pwd.max, input.chain.pwdTyp + 3 * input.chain.pwdSigma)
    const phys = { min: Math.min(lo, hi), max: Math.max(lo, hi) }
    const spwd = input.receiverInvert ? { min: -phys.max, max: -phys.min } : phys
    statistical = { pwd: spwd, worstMarginUi: worstMarginUi(layout, sampler, { ...distortion, pwd: spwd }, errors, set.baud) }
  }

  return {
    channelId: input.channelId,
    baud: set.baud,
    bitTime: T,
    frame: { dataBits: set.dataBits, parity: set.parity, stopBits: set.stopBits, backToBack: set.backToBack, frameBits: layout.frameBits },
    sampler,
    clocks,
    distortion,
    requiredMarginUi: req,
    bits,
    worstMarginUi: worstUi,
    worstBit,
    verdict,
    functional,
    noMarginReason,
    maxBaud: search?.maxBaud ?? null,
    maxBaudCap: search?.cap ?? baudCap(input),
    maxBaudCapped: search?.capped ?? false,
    maxBaudLimitedBy: search?.limitedBy ?? null,
    maxBaudNote: search?.note ?? `No maximum rate: ${noMarginReason}.`,
    clockTolerance: functional ? clockTolerance(layout, sampler, distortion, set.baud, req) : { slowest: null, fastest: null, slowestBit: null, fastestBit: null },
    rateSweep,
    standardRates,
    fastestStandardRate: fastest ? fastest.baud : null,
    pulseCheck,
    berEstimate: estimateBer(bits, distortion, set.berTarget, T),
    statistical,
    warnings,
  }
}

function capitalise(t: string): string {
  return t.charAt(0).toUpperCase() + t.slice(1)
}

/** A quantisation error above 1 % is flagged (a common firmware rule of thumb). */
function generatorWarnings(channelId: string, clocks: { tx: RateErrorBounds; rx: RateErrorBounds }, baud: number): Warning[] {
  const out: Warning[] = []
  for (const [end, b] of [
    ['transmitter', clocks.tx],
    ['receiver', clocks.rx],
  ] as const)
    if (b.generator && b.generator.reachable && Math.abs(b.generator.error) > 0.01)
      out.push({
        code: 'generator-error',
        channel: channelId,
        message: `The ${end}'s baud generator gives ${formatEng(b.generator.actualBaud, 'Bd', { digits: 5 })} for ${formatEng(baud, 'Bd', { digits: 5 })} (divisor ${b.generator.divisor}, error ${(b.generator.error * 100).toFixed(2)} %).`,
      })
  return out
}

/** Highest rate the search reports: the schema's limit, and what each baud generator reaches with divisor 1. */
function baudCap(input: UartChannelInput): number {
  let cap = MAX_BAUD_CAP
  if (input.rx.clockHz !== undefined) cap = Math.min(cap, input.rx.clockHz / input.rx.oversampling)
  if (input.tx.clockHz !== undefined) cap = Math.min(cap, input.tx.clockHz / (input.tx.oversampling ?? TX_DEFAULT_OVERSAMPLING))
  return cap
}

/**
 * Maximum baud meeting the required margin with each end at its stated error bound (a
 * generator's oscillator tolerance; its quantisation depends on the rate and shows in the
 * standard-rates table), below the pulse limit of the chain's stages.
 */
function maxBaudSearch(input: UartChannelInput, layout: FrameLayout, s: SamplerModel, d: Distortion, req: number): MaxBaudResult {
  let cap = baudCap(input)
  const stated = statedClockErrors(input.tx, input.rx)
  let pulseNote = ''
  if (input.pulseLimit) {
    const pwdAbs = Math.max(Math.abs(d.pwd.min), Math.abs(d.pwd.max))
    const limit = 1 / ((input.pulseLimit.seconds + pwdAbs) * (1 + stated.tx.max))
    if (limit < cap) {
      cap = limit
      pulseNote = ` Stage '${input.pulseLimit.stage}' passes no pulse shorter than ${formatEng(input.pulseLimit.seconds, 's')}: no faster rate works.`
    }
  }
  const r = maxBaud(layout, s, d, stated, req, cap)
  return pulseNote && r.capped ? { ...r, capped: false, note: `Limited by the pulse width.${pulseNote}` } : r
}

/** Rate sweep for the plot: log-spaced around the configured and the maximum rate, clocks at their stated bounds. */
function sweepRates(input: UartChannelInput, layout: FrameLayout, s: SamplerModel, table: CaseTable, max: number | null, cap: number): { baud: number; marginUi: number }[] {
  const baud = input.settings.baud
  const stated = statedClockErrors(input.tx, input.rx)
  const top = Math.min(cap, Math.max(baud, max ?? baud) * 4)
  const bottom = Math.max(1, Math.min(baud, max ?? baud) / 10)
  const points = 64
  const rates = new Set<number>([Math.min(baud, cap)])
  if (max !== null) rates.add(max)
  for (let i = 0; i < points; i++) rates.add(bottom * (top / bottom) ** (i / (points - 1)))
  const fixed = fixedClockCases(layout, s, stated)
  return [...rates]
    .filter((b) => b <= cap)
    .sort((a, b) => a - b)
    .map((b) => ({ baud: b, marginUi: fixedClockWorstUi(fixed, table, b) }))
}

/** The usual rates, each with both generators recomputed at it. */
function standardRateRows(input: UartChannelInput, table: CaseTable, d: Distortion, functional: boolean): StandardRateRow[] {
  const req = input.settings.requiredMarginUi
  return STANDARD_BAUD_RATES.map((baud) => {
    const c = clocksAt(input, baud)
    const gen = c.rx.generator ?? c.tx.generator
    const unreachable = unreachableRate(c, baud)
    const pulse = pulseCheckAt(input, d, c.tx, baud)
    const note = !functional ? 'the channel cannot carry data' : unreachable ?? (pulse && !pulse.pass ? `pulse shorter than stage '${pulse.stage}' passes` : null)
    const m = note === null ? tableWorstUi(table, { tx: c.tx, rx: c.rx }, baud) : null
    return {
      baud,
      marginUi: m,
      pass: m !== null && m >= req,
      divisor: gen ? gen.divisor : null,
      error: gen ? gen.error : null,
      generators: { tx: c.tx.generator, rx: c.rx.generator },
      note,
    }
  })
}

/**
 * Statistical view: random jitter (rms, root-sum-square over stages) on each edge and
 * on the sync edge, so an edge moves against the sync edge with sigma sqrt(2) RJ. The
 * probability that it crosses a worst-case margin m (peak jitter already spent there)
 * is the Gaussian tail Q(m / sigma); the dual-Dirac total jitter at the BER target is
 * TJ = DJ + 2 Q(BER) RJ with DJ = 2 x peak jitter.
 */
export function estimateBer(bits: readonly UartBitResult[], d: Distortion, berTarget: number, T: number): BerEstimate {
  const sigma = Math.SQRT2 * d.jitterRms
  const tail = (m: number) => (sigma > 0 ? gaussianTail(m / sigma) : m < 0 ? 1 : 0)
  const rows = bits.map((b) => {
    const p = Math.min(1, tail(b.earlyMargin) + (b.lateMargin === null ? 0 : tail(b.lateMargin)))
    return { index: b.index, label: b.label, errorProbability: p }
  })
  let logOk = 0
  let worst = 0
  for (const r of rows) {
    worst = Math.max(worst, r.errorProbability)
    logOk += r.errorProbability >= 1 ? -Infinity : Math.log1p(-r.errorProbability)
  }
  const frame = logOk === -Infinity ? 1 : logOk === 0 ? 0 : -Math.expm1(logOk)
  const q = qFromBer(berTarget)
  const tj = totalJitter(2 * d.jitterPeak, d.jitterRms, berTarget)
  return {
    berTarget,
    q,
    rjRms: d.jitterRms,
    djPeakToPeak: 2 * d.jitterPeak,
    totalJitter: tj,
    totalJitterUi: tj / T,
    edgeSigma: sigma,
    bits: rows,
    worstBitErrorProbability: worst,
    frameErrorProbability: frame,
    meetsTarget: bits.length > 0 && worst <= berTarget,
  }
}
