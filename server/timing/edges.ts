/**
 * Threshold crossings of a single edge (timing-model.md section 1).
 *
 * Datasheet delays are measured 50 % to 50 %; the next input switches at its own
 * threshold. These functions give the time from an edge's 50 % point to its crossing
 * of a threshold at fraction x of the swing, x = (Vth - Vlow) / (Vhigh - Vlow):
 *
 * - exponential edge (a resistor charging a capacitance, v = V(1 - e^(-t/tau))),
 *   tau = t(10-90 %) / ln 9:
 *   rising  tau * (ln(1/(1 - x)) - ln 2), falling tau * (ln(1/x) - ln 2);
 * - ramp (actively driven, linear between 10 % and 90 %):
 *   rising  tr * (x - 0.5) / 0.8,         falling tf * (0.5 - x) / 0.8.
 *
 * All times in seconds; a positive offset means the threshold is crossed after the
 * 50 % point.
 */
import type { EdgeShape } from './types'

/** ln 9: the 10-90 % time of a single-pole exponential edge, in units of tau. */
export const LN9 = Math.log(9)
/** ln 2: the 50 % point of a single-pole exponential edge, in units of tau. */
export const LN2 = Math.LN2

export type Direction = 'rise' | 'fall'

/** x = (Vth - Vlow) / (Vhigh - Vlow): where a threshold sits in the driving swing. */
export function thresholdFraction(vth: number, vLow: number, vHigh: number): number {
  return (vth - vLow) / (vHigh - vLow)
}

/**
 * Shape factor g(x): offset = transition * g(x), with transition the 10-90 % (rising)
 * or 90-10 % (falling) time. Requires 0 < x < 1 for an exponential edge.
 */
export function offsetFactor(direction: Direction, shape: EdgeShape, x: number): number {
  if (shape === 'exponential') {
    return direction === 'rise' ? (Math.log(1 / (1 - x)) - LN2) / LN9 : (Math.log(1 / x) - LN2) / LN9
  }
  return direction === 'rise' ? (x - 0.5) / 0.8 : (0.5 - x) / 0.8
}

/**
 * Time from the 50 % point of an edge to its crossing of fraction x of the swing,
 * seconds. `transition` is the edge's 10-90 % (rising) or 90-10 % (falling) time.
 */
export function thresholdOffset(direction: Direction, shape: EdgeShape, transition: number, x: number): number {
  if (transition === 0) return 0
  return transition * offsetFactor(direction, shape, x)
}

/** Time for an exponential edge to go from 0 to fraction x of its swing: tau * ln(1/(1 - x)). */
export function exponentialRiseTime(tau: number, x: number): number {
  return tau * Math.log(1 / (1 - x))
}

/** Time for an exponential falling edge to go from the full swing to fraction x: tau * ln(1/x). */
export function exponentialFallTime(tau: number, x: number): number {
  return tau * Math.log(1 / x)
}

/** tau of an exponential edge from its 10-90 % time: tau = t / ln 9. */
export function tauFromTransition(transition: number): number {
  return transition / LN9
}
