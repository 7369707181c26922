/** The receiver's sampler: the ticks after the detection tick at which each bit is sampled. (timing-model.md section 2; the method is described in ../uart.ts) */
import type { ClockSpec } from '../clock'
import { EngineInputError } from '../errors'
import type { Vote, SamplerModel } from '../../../shared/types/analysis'

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
