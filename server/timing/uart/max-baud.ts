/** The maximum baud: the margin at fixed clocks as A - baud * b per case, solved in closed form, and the search over generator quantisation. (timing-model.md section 2; the method is described in ../uart.ts) */
import type { SamplerModel, Distortion, ClockErrors, MaxBaudResult } from '../../../shared/types/analysis'
import type { FrameLayout } from './frame'
import { caseTerms, type CaseTable, caseTable, tableWorstUi, worstMarginUi } from './margins'

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
