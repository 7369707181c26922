/** Per-bit margins in closed form: each case's losses (sampling, clock, asymmetry, jitter), the bits' early and late margins, and the frame's worst margin. (timing-model.md section 2; the method is described in ../uart.ts) */
import { bitTimeBounds } from '../clock'
import type { SamplerModel, LimitedBy, Distortion, ClockErrors, MarginLosses, UartBitResult } from '../../../shared/types/analysis'
import type { FrameCase, FrameLayout } from './frame'

/** A case's margin split into its UI-invariant part and its distortion part. */
export interface CaseTerms {
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
export function asymmetryLoss(c: FrameCase, side: 'early' | 'late', d: Distortion): number {
  if (!c.rising) return 0
  return side === 'early' ? Math.max(d.pwd.max, 0) : -Math.min(d.pwd.min, 0)
}

export function jitterLoss(c: FrameCase, side: 'early' | 'late', d: Distortion): number {
  return side === 'early' && c.sync ? 0 : 2 * d.jitterPeak
}

export function caseTerms(c: FrameCase, side: 'early' | 'late', s: SamplerModel, d: Distortion, e: ClockErrors): CaseTerms {
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
