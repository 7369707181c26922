import { describe, expect, it } from 'vitest'
import { fc, test } from '@fast-check/vitest'
import { formatEng, formatInput, formatPercent, formatUi, parseEng } from '../../../../shared/utils/units'

const value = (text: string, unit?: string) => {
  const r = parseEng(text, unit)
  if (!r.ok) throw new Error(r.message)
  return r.value
}

describe('parseEng', () => {
  it.each([
    ['4.7k', 'Ω', 4700],
    ['4k7', 'Ω', 4700],
    ['4R7', 'Ω', 4.7],
    ['470R', 'Ω', 470],
    ['4.7 kΩ', 'Ω', 4700],
    ['4.7 kohm', 'Ω', 4700],
    ['25 us', 's', 25e-6],
    ['25µs', 's', 25e-6],
    ['1.5u', 's', 1.5e-6],
    ['1.5e-6', 's', 1.5e-6],
    ['2 ms', 's', 2e-3],
    ['2m', 's', 2e-3],
    ['38.4 kBd', 'Bd', 38400],
    ['38400 baud', 'Bd', 38400],
    ['115200', 'Bd', 115200],
    ['15 pF', 'F', 15e-12],
    ['15p', 'F', 15e-12],
    ['1f', 'F', 1e-15],
    ['1 m', 'm', 1],
    ['30 mm', 'm', 0.03],
    ['8 MHz', 'Hz', 8e6],
    ['3.3 V', 'V', 3.3],
    ['5 mA', 'A', 5e-3],
    ['-2 ns', 's', -2e-9],
    ['0,5', '', 0.5],
    ['  12  ', '', 12],
    ['.5k', 'Ω', 500],
  ])('%s (%s) = %d', (text, unit, expected) => {
    expect(value(text, unit)).toBeCloseTo(expected, 18)
    expect(value(text, unit) / expected).toBeCloseTo(1, 12)
  })

  it('returns clean decimals, not binary noise', () => {
    expect(value('4.7k', 'Ω')).toBe(4700)
    expect(value('0.1u', 's')).toBe(1e-7)
  })

  it.each([
    ['', 'enter a value'],
    ['abc', 'not a number'],
    ['4.7 q', "unknown unit 'q'"],
    ['5 V', 'unknown unit'],
    ['1e999', 'out of range'],
  ])('rejects %j with a message', (text, message) => {
    const r = parseEng(text, 's')
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.message).toContain(message)
  })
})

describe('formatEng', () => {
  it.each([
    [4700, 'Ω', '4.7 kΩ'],
    [25e-6, 's', '25 µs'],
    [38400, 'Bd', '38.4 kBd'],
    [15e-12, 'F', '15 pF'],
    [-1.234e-9, 's', '-1.23 ns'],
    [0, 's', '0 s'],
    [1, 'V', '1 V'],
    [999.96, 'Hz', '1 kHz'],
    [0.5, '', '0.5'],
    [1e-12, '', '1e-12'],
    [0.1, 'UI', '0.1 UI'],
    [10000, 'ppm', '10000 ppm'],
    [8e6, 'Hz', '8 MHz'],
  ])('%d %s -> %s', (v, unit, text) => {
    expect(formatEng(v, unit)).toBe(text)
  })

  it('prints a dash for missing or non-finite values', () => {
    expect(formatEng(null, 's')).toBe('–')
    expect(formatEng(Number.NaN, 's')).toBe('–')
    expect(formatEng(Number.POSITIVE_INFINITY, 's')).toBe('–')
  })

  it('keeps trailing zeros when asked', () => {
    expect(formatEng(4700, 'Ω', { fixed: true })).toBe('4.70 kΩ')
  })

  it('falls back to exponent notation beyond the prefix table', () => {
    expect(formatEng(1e-18, 's')).toBe('1.00e-18 s')
  })
})

describe('formatInput, formatPercent, formatUi', () => {
  it('formats for inputs and reports', () => {
    expect(formatInput(4700, 'Ω')).toBe('4.7 kΩ')
    expect(formatInput(undefined, 'Ω')).toBe('')
    expect(formatPercent(0.125)).toBe('12.5 %')
    expect(formatUi(0.1234)).toBe('+0.123 UI')
    expect(formatUi(-0.0412)).toBe('-0.041 UI')
    expect(formatUi(-0.0001)).toBe('0.000 UI')
    expect(formatUi(null)).toBe('–')
  })
})

describe('round trip', () => {
  const units = ['s', 'Ω', 'F', 'Hz', 'Bd', 'V', 'A']
  test.prop([fc.double({ min: 1e-14, max: 1e9, noNaN: true }), fc.constantFrom(...units)])(
    'parse(formatInput(x)) is x to 4 significant digits',
    (x, unit) => {
      const back = value(formatInput(x, unit), unit)
      expect(Math.abs(back - x) / x).toBeLessThan(5e-4)
    },
  )
})
