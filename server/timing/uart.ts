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
import type { Parity, Vote, SamplerModel, LimitedBy, Distortion, ClockErrors, MarginLosses, UartBitResult, MaxBaudResult, ClockTolerance, StandardRateRow, BerEstimate, PulseCheck, UartChannelResult } from '../../shared/types/analysis'
export type { Parity, Vote, SamplerModel, LimitedBy, Distortion, ClockErrors, MarginLosses, UartBitResult, MaxBaudResult, ClockTolerance, StandardRateRow, BerEstimate, PulseCheck, UartChannelResult }

export * from './uart/frame'
export * from './uart/sampler'
export * from './uart/margins'
export * from './uart/max-baud'
export * from './uart/tolerance'
export * from './uart/channel'
