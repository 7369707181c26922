/**
 * UART clocks (timing-model.md section 2, "Clocks"): the baud-rate generator's
 * quantisation and each end's bit-rate error bound.
 *
 * A generator divides its peripheral clock f by N * divisor, N the oversampling; the
 * divisor f / (N * baud) is rounded to its resolution 1/2^fractionBits (an integer for
 * 0 fraction bits), at least 1. The actual rate f / (N * divisor) differs from the
 * requested one by the quantisation error; the oscillator's own tolerance comes on top.
 */
import { EngineInputError } from './errors'
import type { BaudGeneratorResult, RateErrorBounds } from '../../shared/types/analysis'
export type { BaudGeneratorResult, RateErrorBounds }


/**
 * The divisor, actual rate and error of a baud generator.
 * @param clockHz peripheral clock, hertz
 * @param oversampling ticks per bit N (16, 8 ...)
 * @param fractionBits fractional bits of the divisor (0 integer, 4 for 1/16 steps)
 * @param baud requested rate, baud
 */
export function baudGenerator(clockHz: number, oversampling: number, fractionBits: number, baud: number): BaudGeneratorResult {
  if (!(clockHz > 0) || !Number.isFinite(clockHz)) throw new EngineInputError(['clockHz'], 'the generator clock must be a positive number of hertz')
  if (!Number.isInteger(oversampling) || oversampling < 1) throw new EngineInputError(['oversampling'], 'oversampling must be a positive integer')
  if (!Number.isInteger(fractionBits) || fractionBits < 0 || fractionBits > 16) throw new EngineInputError(['fractionBits'], 'fractionBits must be an integer 0 to 16')
  if (!(baud > 0) || !Number.isFinite(baud)) throw new EngineInputError(['baud'], 'baud must be a positive number')
  const steps = 2 ** fractionBits
  const exact = clockHz / (oversampling * baud)
  const rounded = Math.round(exact * steps) / steps
  const divisor = Math.max(1, rounded)
  const actualBaud = clockHz / (oversampling * divisor)
  return { divisor, actualBaud, error: actualBaud / baud - 1, reachable: rounded >= 1, fractional: divisor !== Math.floor(divisor) }
}

/** The clock fields of one UART end, as in the link schema. */
export interface ClockSpec {
  errorPpm?: number
  clockHz?: number
  fractionBits?: number
  tolerancePpm?: number
}


/**
 * Rate error bounds of one end at `baud`: a stated +-errorPpm, or the generator's
 * quantisation error combined with the oscillator tolerance,
 * rate = actualBaud * (1 +- tolerance). With a generator, errorPpm (when given and
 * tolerancePpm is not) is taken as the oscillator tolerance.
 */
export function rateErrorBounds(spec: ClockSpec, baud: number, oversampling: number): RateErrorBounds {
  if (spec.clockHz !== undefined) {
    const generator = baudGenerator(spec.clockHz, oversampling, spec.fractionBits ?? 0, baud)
    const tolerancePpm = spec.tolerancePpm ?? spec.errorPpm ?? 0
    const tol = tolerancePpm * 1e-6
    return {
      min: (1 + generator.error) * (1 - tol) - 1,
      max: (1 + generator.error) * (1 + tol) - 1,
      generator,
      tolerancePpm,
    }
  }
  const e = (spec.errorPpm ?? 0) * 1e-6
  return { min: -e, max: e, generator: null, tolerancePpm: spec.errorPpm ?? 0 }
}

/**
 * Bit-time bounds of one end, seconds: T = 1 / (baud * (1 + e)) over the error interval.
 * The shortest bit belongs to the fastest clock.
 */
export function bitTimeBounds(bounds: Pick<RateErrorBounds, 'min' | 'max'>, baud: number): { min: number; max: number } {
  return { min: 1 / (baud * (1 + bounds.max)), max: 1 / (baud * (1 + bounds.min)) }
}

/**
 * The error bound an end states for itself, independent of the rate: +-errorPpm, or a
 * generator's oscillator tolerance (its quantisation error depends on the rate and is
 * left to the standard-rates table). The maximum-baud search and the rate sweep use it.
 */
export function statedErrorBounds(spec: ClockSpec): { min: number; max: number } {
  const ppm = spec.clockHz !== undefined ? (spec.tolerancePpm ?? spec.errorPpm ?? 0) : (spec.errorPpm ?? 0)
  return { min: -ppm * 1e-6, max: ppm * 1e-6 }
}
