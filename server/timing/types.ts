/**
 * Types shared by the engine's modules. The engine is pure TypeScript: relative
 * imports only, no framework, no database.
 */
import type { DelaySpec } from '../../shared/schemas/link'

/** A {min, typ, max} triple in seconds. */
export type Corners = DelaySpec

/** Output edge shape: actively driven (ramp) or a resistor charging a capacitance. */
export type EdgeShape = 'ramp' | 'exponential'

/** A warning in plain words, with a stable code for the UI and tests. */
export interface Warning {
  code:
    | 'extrapolation'
    | 'slow-edge'
    | 'unsaturated'
    | 'inverted-polarity'
    | 'absolute-maximum'
    | 'single-point-fit'
    | 'rate-cap'
    | 'no-pass'
    | 'generator-error'
    | 'threshold-unreachable'
    | 'other'
  message: string
  channel?: string
  stage?: number
}

/**
 * What the chain needs from any stage: its behaviour for one output direction.
 * Every stage kind (digital, phototransistor, wire, rc) is reduced to this.
 */
export interface StageEdgeModel {
  /** the stage inverts the logic level */
  inverting: boolean
  /** delay when the OUTPUT goes low-to-high, 50 % to 50 %, seconds */
  tplh: Corners
  /** delay when the OUTPUT goes high-to-low, 50 % to 50 %, seconds */
  tphl: Corners
  /** |tPLH - tPHL| bound for one part, seconds (tighter than the corners), if stated */
  pwdMax?: number
  /** output rise time 10-90 %, seconds {typ, max}; 0 for an ideal edge */
  tr: { typ: number; max: number }
  /** output fall time 90-10 %, seconds {typ, max} */
  tf: { typ: number; max: number }
  riseShape: EdgeShape
  fallShape: EdgeShape
  /** output swing, volts */
  vLow: number
  vHigh: number
  partSkew: number
  jitterRms: number
  jitterPeak: number
  /**
   * Output directions in which the stage does not re-switch but passes its input edge on
   * (shape, transition time and swing kept), delayed by tPLH / tPHL: both directions of a
   * wire, the actively driven direction of an rc stage. Absent: the stage switches at its
   * input threshold in both directions.
   */
  passThrough?: { rise: boolean; fall: boolean }
}

/**
 * The chain result of one channel (timing-model.md section 1). Directions are those of
 * the edge at the RECEIVING PIN (physical, before the receiver's own `invert`); delays
 * run from the driving pin's 50 % crossing to the receiver's switching instant.
 */
export interface ChainResult {
  id: string
  role: string
  /** delay of an edge that rises at the receiving pin, seconds */
  rise: Corners
  /** delay of an edge that falls at the receiving pin, seconds */
  fall: Corners
  /** signed D_rise - D_fall, worst-case interval, seconds */
  pwd: { min: number; max: number }
  /** statistical spread (1 sigma) of D_rise - D_fall, seconds (root-sum-square) */
  pwdSigma: number
  /** kept: the receiving pin follows the driving pin; inverted: an odd number of inverting stages */
  polarity: 'kept' | 'inverted'
  /** received 10-90 % rise and 90-10 % fall times at the receiving pin, seconds */
  tr: { typ: number; max: number }
  tf: { typ: number; max: number }
  riseShape: EdgeShape
  fallShape: EdgeShape
  /** random jitter at the receiver, rms seconds (root-sum-square over stages) */
  jitterRms: number
  /** bounded jitter at the receiver, peak seconds (sum over stages) */
  jitterPeak: number
  /** part-to-part skew bound of the whole chain, seconds (sum over stages) */
  partSkew: number
  warnings: Warning[]
}
