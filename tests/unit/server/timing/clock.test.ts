import { describe, expect, it } from 'vitest'
import { baudGenerator, rateErrorBounds, bitTimeBounds } from '../../../../server/timing/clock'
import { EngineInputError } from '../../../../server/timing/errors'

describe('baud-rate generator quantisation', () => {
  it('reproduces the STM32F4 fractional divisor table (OVER8 = 0, 4 fraction bits)', () => {
    // references.md 1.8: RM0090 Rev 11 Table 137
    const rows: [number, number, number, number, number][] = [
      [8e6, 115200, 4.3125, 115942, 0.644],
      [16e6, 115200, 8.6875, 115108, -0.08],
      [8e6, 460800, 1.0625, 470588, 2.124],
      [16e6, 921600, 1.0625, 941176, 2.124],
      [8e6, 9600, 52.0625, 9604, 0.04],
    ]
    for (const [f, baud, div, actual, errPct] of rows) {
      const g = baudGenerator(f, 16, 4, baud)
      expect(g.divisor).toBe(div)
      expect(Math.abs(g.actualBaud - actual)).toBeLessThan(1)
      expect(Math.abs(g.error * 100 - errPct)).toBeLessThan(0.005)
    }
  })

  it('reproduces the RM0399 BRR examples (BRR = 16 x divisor at OS16)', () => {
    expect(baudGenerator(8e6, 16, 4, 9600).divisor * 16).toBe(833) // references.md 1.8: RM0399, 9600 Bd at 8 MHz -> BRR 833
    expect(baudGenerator(48e6, 16, 4, 921600).divisor * 16).toBe(52) // references.md 1.8: RM0399, 921.6 kBd at 48 MHz -> BRR 52
  })

  it('integer divisors as on an AVR (UBRR = divisor - 1)', () => {
    const g = baudGenerator(16e6, 16, 0, 115200) // references.md 1.8 [D]: UBRR 8, 111111 Bd, -3.549 %
    expect(g.divisor - 1).toBe(8)
    expect(g.actualBaud).toBeCloseTo(111111.1, 1)
    expect(g.error * 100).toBeCloseTo(-3.549, 3)
    expect(baudGenerator(16e6, 8, 0, 115200).divisor - 1).toBe(16) // references.md 1.8 [M, recomputed D]: U2X -> UBRR 16
    expect(baudGenerator(16e6, 8, 0, 115200).error * 100).toBeCloseTo(2.12, 2) // references.md 1.8 [M, recomputed D]: +2.1 %
    expect(baudGenerator(16e6, 16, 0, 9600).divisor - 1).toBe(103) // references.md 1.8 [M, recomputed D]: UBRR 103, +0.2 %
    expect(baudGenerator(16e6, 16, 0, 9600).error * 100).toBeCloseTo(0.16, 2)
  })

  it('never divides by less than 1', () => {
    const g = baudGenerator(1e6, 16, 0, 1e6) // common practice: a divisor register cannot hold 0
    expect(g.divisor).toBe(1)
    expect(g.actualBaud).toBe(62500)
  })

  it('rejects a clock that is not a positive number, naming the field', () => {
    expect(() => baudGenerator(0, 16, 0, 9600)).toThrow(EngineInputError)
    try {
      baudGenerator(8e6, 16, 0, -1)
    } catch (e) {
      expect((e as EngineInputError).path).toEqual(['baud'])
    }
  })
})

describe('clock error bounds', () => {
  it('a stated bound is symmetric; a generator adds its oscillator tolerance around its own error', () => {
    expect(rateErrorBounds({ errorPpm: 20000 }, 9600, 16)).toMatchObject({ min: -0.02, max: 0.02 }) // timing-model.md 2: errorPpm 20000 = +-2 %
    const b = rateErrorBounds({ clockHz: 8e6, fractionBits: 4, tolerancePpm: 100 }, 115200, 16)
    expect(b.generator!.error).toBeCloseTo(0.00644, 5) // references.md 1.8: +0.64 %
    expect(b.max).toBeCloseTo(1.00644 * 1.0001 - 1, 5)
    expect(b.min).toBeCloseTo(1.00644 * 0.9999 - 1, 5)
    const t = bitTimeBounds({ min: -0.02, max: 0.02 }, 1000)
    expect(t.min).toBeCloseTo(1 / 1020, 12)
    expect(t.max).toBeCloseTo(1 / 980, 12)
  })
})
