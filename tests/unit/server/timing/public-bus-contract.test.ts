/**
 * The bus functions named as a public contract in issue 15, called as outside test suites call
 * them (from server/timing/index.ts), against published values.
 */
import { describe, expect, it } from 'vitest'
import { canOscillatorTolerance, canPropSegTq, i2cRiseTime, i2cRpMax, i2cRpMin, EngineInputError } from '../../../../server/timing'

describe('CAN public contract', () => {
  it('canPropSegTq: the worked example, 640 ns of round trip at tq 100 ns is 7 tq', () => {
    // TI DCAN TRM section 23.3.16.2.2 (after the Bosch C_CAN text): driver 60 ns + receiver 40 ns, 40 m of line 220 ns
    expect(canPropSegTq({ tq: 100e-9, nodeOutputDelay: 60e-9, busDelay: 220e-9, nodeInputDelay: 40e-9 })).toBe(7)
    // one more nanosecond of delay needs one more time quantum
    expect(canPropSegTq({ tq: 100e-9, nodeOutputDelay: 60e-9, busDelay: 231e-9, nodeInputDelay: 40e-9 })).toBe(7)
    expect(canPropSegTq({ tq: 100e-9, nodeOutputDelay: 60e-9, busDelay: 251e-9, nodeInputDelay: 40e-9 })).toBe(8)
  })

  it('canOscillatorTolerance: both conditions and their minimum', () => {
    // Bosch CAN specification 2.0 part B section 9 / TI DCAN TRM: Phase_Seg1 = Phase_Seg2 = SJW = 4, 10 tq -> I = 4/252 (1.58 %), II = 4/200 (2 %)
    const t = canOscillatorTolerance({ phaseSeg1: 4, phaseSeg2: 4, sjw: 4, bitTq: 10 })
    expect(t.cond1).toBeCloseTo(4 / 252, 12)
    expect(t.cond2).toBeCloseTo(0.02, 12)
    expect(t.tolerance).toBeCloseTo(4 / 252, 12)
    // references.md 4.2 [D]: the formula evaluated, condition II the smaller
    const u = canOscillatorTolerance({ phaseSeg1: 1, phaseSeg2: 1, sjw: 1, bitTq: 10 })
    expect(u.tolerance).toBeCloseTo(Math.min(1 / 258, 0.005), 12)
  })

  it('refuses a setting that cannot exist, naming the field', () => {
    expect(() => canOscillatorTolerance({ phaseSeg1: 4, phaseSeg2: 4, sjw: 5, bitTq: 10 })).toThrow(EngineInputError)
    expect(() => canOscillatorTolerance({ phaseSeg1: 4, phaseSeg2: 5, sjw: 1, bitTq: 10 })).toThrow(/bitTq/)
    expect(() => canPropSegTq({ tq: 0, nodeOutputDelay: 1e-9, busDelay: 0, nodeInputDelay: 0 })).toThrow(/time quantum/)
    expect(() => canPropSegTq({ tq: 1e-7, nodeOutputDelay: -1e-9, busDelay: 0, nodeInputDelay: 0 })).toThrow(/nodeOutputDelay/)
  })
})

describe('I2C public contract', () => {
  it('i2cRiseTime is 0.8473 Rp Cb (30 % to 70 %)', () => {
    // NXP UM10204 section 7.1: t = 0.8473 x Rp x Cb
    expect(i2cRiseTime(1000, 100e-12)).toBeCloseTo(0.8473e-7, 10)
  })
  it('i2cRpMin and i2cRpMax give the worked pull-up range', () => {
    // NXP UM10204 section 7.1: Rp(min) = (VDD - VOL(max)) / IOL; 3.3 V, 0.4 V, 3 mA -> 967 ohm
    expect(i2cRpMin(3.3, 0.4, 3e-3)).toBeCloseTo(966.7, 1)
    // NXP UM10204 section 7.1: Rp(max) = tr / (0.8473 Cb); Fast mode 300 ns at 200 pF -> 1770 ohm
    expect(i2cRpMax(300e-9, 200e-12)).toBeCloseTo(1770, 0)
  })
})
