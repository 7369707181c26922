import { describe, expect, it } from 'vitest'
import { LN2, LN9, offsetFactor, thresholdFraction, thresholdOffset, exponentialRiseTime, exponentialFallTime, tauFromTransition } from '../../../../server/timing/edges'

const RC = 1e-6

describe('single-pole RC edge relations', () => {
  it('10-90 %, 50 %, 30-70 % and 20-80 % times', () => {
    const t = (x: number) => exponentialRiseTime(RC, x)
    expect((t(0.9) - t(0.1)) / RC).toBeCloseTo(2.1972246, 7) // references.md 5.2: RC ln 9 [D]
    expect(t(0.5) / RC).toBeCloseTo(0.6931472, 7) // references.md 5.2: RC ln 2 [D]
    expect((t(0.7) - t(0.3)) / RC).toBeCloseTo(0.8472979, 7) // references.md 5.2 / 3: UM10204 0.8473 RC
    expect(t(0.3) / RC).toBeCloseTo(0.3566749, 7) // references.md 3: UM10204 t1 = 0.3566749 RC
    expect(t(0.7) / RC).toBeCloseTo(1.2039729, 6) // references.md 3: UM10204 t2 = 1.2039729 RC (ln(1/0.3) = 1.20397280, printed rounded up)
    expect((t(0.8) - t(0.2)) / RC).toBeCloseTo(1.3862944, 7) // references.md 5.2: RC ln 4 [D]
    expect(t(0.632) / RC).toBeCloseTo(1.0, 2) // references.md 5.2: t(0.632) ~ 1 RC [D]
    expect(LN9).toBeCloseTo(2.1972246, 7) // references.md 5.2
    expect(LN2).toBeCloseTo(0.6931472, 7) // references.md 5.2
  })

  it('threshold crossings of LVCMOS33 levels on a 3.3 V exponential edge', () => {
    expect(exponentialRiseTime(RC, 2.0 / 3.3) / RC).toBeCloseTo(0.93156, 5) // references.md 5.2: RC ln(3.3/1.3), VIH 2.0 V
    expect(exponentialRiseTime(RC, 0.7) / RC).toBeCloseTo(1.20397, 5) // references.md 5.2: riseTo 0.7 V
    expect(exponentialFallTime(RC, 0.8 / 3.3) / RC).toBeCloseTo(1.41707, 5) // references.md 5.2: RC ln(3.3/0.8), VIL 0.8 V
  })

  it('the offset from the 50 % point matches the crossing time less RC ln 2', () => {
    const tr = RC * LN9
    expect(tauFromTransition(tr)).toBeCloseTo(RC, 15)
    // timing-model.md section 1 formula against references.md 5.2 crossing times
    expect(thresholdOffset('rise', 'exponential', tr, 2.0 / 3.3) / RC).toBeCloseTo(0.93156 - 0.6931472, 5)
    expect(thresholdOffset('fall', 'exponential', tr, 0.8 / 3.3) / RC).toBeCloseTo(1.41707 - 0.6931472, 5)
    expect(thresholdOffset('rise', 'exponential', tr, 0.5)).toBeCloseTo(0, 18)
  })

  it('a ramp crosses 10 % and 90 % at -+ tr/2 around its 50 % point', () => {
    // references.md 5.1 (IEEE 181 style): a linear 0-3.3 V ramp over 1 us has 10-90 % = 0.8 us, 50 % at 0.5 us
    const tr = 0.8e-6
    expect(thresholdOffset('rise', 'ramp', tr, 0.1)).toBeCloseTo(-0.4e-6, 15)
    expect(thresholdOffset('rise', 'ramp', tr, 0.9)).toBeCloseTo(0.4e-6, 15)
    expect(thresholdOffset('rise', 'ramp', tr, 1.0)).toBeCloseTo(0.5e-6, 15)
    expect(thresholdOffset('fall', 'ramp', tr, 0.9)).toBeCloseTo(-0.4e-6, 15)
    expect(offsetFactor('fall', 'ramp', 0.5)).toBe(0)
  })

  it('threshold fraction of the swing', () => {
    expect(thresholdFraction(2.0, 0, 3.3)).toBeCloseTo(0.60606, 5) // common practice: (Vth - Vlow)/(Vhigh - Vlow)
    expect(thresholdFraction(1.0, 0.4, 5)).toBeCloseTo(0.6 / 4.6, 12)
  })
})
