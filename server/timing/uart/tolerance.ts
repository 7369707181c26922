/** The clock tolerance: the incoming-rate range that keeps the required margin, one linear inequality per case. (timing-model.md section 2; the method is described in ../uart.ts) */
import type { SamplerModel, Distortion, ClockTolerance } from '../../../shared/types/analysis'
import type { FrameLayout } from './frame'
import { asymmetryLoss, jitterLoss } from './margins'

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
