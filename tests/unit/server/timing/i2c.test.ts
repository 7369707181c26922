/**
 * One side of an isolated I2C bus against published values (references.md section 3, NXP
 * UM10204 section 7.1 and TI SLVA689): the 30 %-70 % rise constant, Rp(min) and Rp(max), the
 * worked example's pull-up range, and the checks of a side.
 */
import { describe, expect, it } from 'vitest'
import { I2C_MODES, i2cBus, i2cPullupChoices, i2cRiseTime, i2cRpMax, i2cRpMin, i2cSide, i2cVolMax, RISE_30_70 } from '../../../../server/timing/i2c'

describe('the open-drain edge', () => {
  it('rises from 30 % to 70 % in 0.8473 RC', () => {
    // UM10204 section 7.1: t1 = 0.3566749 RC, t2 = 1.2039729 RC, tr = 0.8473 RC
    expect(-Math.log(0.7)).toBeCloseTo(0.3566749, 7)
    expect(-Math.log(0.3)).toBeCloseTo(1.2039729, 6)
    expect(RISE_30_70).toBeCloseTo(0.8472979, 7)
    // references.md section 3 [D]: Rp 1 kOhm, Cb 90 pF -> 76.3 ns
    expect(i2cRiseTime(1000, 90e-12)).toBeCloseTo(76.26e-9, 11)
  })
})

describe('pull-up range', () => {
  it.each([
    // TI SLVA689 section 4: Fast-mode, 3.3 V, VOL 0.4 V at 3 mA -> 966.67 Ohm
    [3.3, 0.4, 3e-3, 966.67],
    // references.md section 3 [D]
    [5.0, 0.4, 3e-3, 1533.3],
    [3.3, 0.4, 20e-3, 145],
  ])('Rp(min) at %f V, VOL %f V, IOL %f A -> %f ohm', (vdd, vol, iol, rp) => {
    expect(i2cRpMin(vdd, vol, iol)).toBeCloseTo(rp, 1)
  })

  it.each([
    // TI SLVA689 section 4: Fast-mode (300 ns), Cb 200 pF -> 1.77 kOhm
    [300e-9, 200e-12, 1770.3],
    // references.md section 3 [D]
    [1000e-9, 400e-12, 2950.5],
    [300e-9, 400e-12, 885.2],
    [120e-9, 550e-12, 257.5],
  ])('Rp(max) for tr %f s, Cb %f F -> %f ohm', (tr, cb, rp) => {
    expect(i2cRpMax(tr, cb)).toBeCloseTo(rp, 0)
  })

  it('offers the E24 values of the worked example\'s range, 966.67 ohm to 1.77 kohm', () => {
    // TI SLVA689 section 4: "any value between 966.667 Ohm and 1.77 kOhm"; IEC 60063:2015, E24 series
    expect(i2cPullupChoices({ vdd: 3.3, cb: 200e-12 }, 'fast', 'E24')).toEqual([1000, 1100, 1200, 1300, 1500, 1600])
    // nothing fits: Fast-mode Plus limits at 550 pF need Rp <= 257 ohm, the 20 mA drivers allow >= 145 ohm at 3.3 V
    expect(i2cPullupChoices({ vdd: 3.3, cb: 550e-12 }, 'fast-plus', 'E12').every((r) => r >= 145 && r <= 257.5)).toBe(true)
    expect(i2cPullupChoices({ vdd: 5, cb: 400e-12 }, 'fast', 'E12')).toEqual([])
  })
})

describe('a side of the bus', () => {
  it('uses the mode limits of UM10204 Table 10', () => {
    // UM10204 Table 10 (references.md section 3)
    expect(I2C_MODES.standard).toMatchObject({ fSclMax: 100e3, riseMax: 1000e-9, cbMax: 400e-12, iol: 3e-3, tLow: 4.7e-6, tHigh: 4.0e-6, tSuDat: 250e-9 })
    expect(I2C_MODES.fast).toMatchObject({ fSclMax: 400e3, riseMax: 300e-9, tLow: 1.3e-6, tHigh: 0.6e-6, tSuDat: 100e-9 })
    expect(I2C_MODES['fast-plus']).toMatchObject({ fSclMax: 1e6, riseMax: 120e-9, cbMax: 550e-12, iol: 20e-3, tLow: 0.5e-6, tHigh: 0.26e-6, tSuDat: 50e-9 })
    // VOL(max): 0.4 V above 2 V, 0.2 VDD at 2 V or less
    expect(i2cVolMax(3.3)).toBe(0.4)
    expect(i2cVolMax(1.8)).toBeCloseTo(0.36, 12)
  })

  it('passes a side inside the range and names each failing check', () => {
    const good = i2cSide({ vdd: 3.3, rp: 1500, cb: 200e-12 }, 'fast')
    expect(good.pass).toBe(true)
    expect(good.rpMin).toBeCloseTo(966.67, 1)
    expect(good.rpMax).toBeCloseTo(1770.3, 1)
    const slow = i2cSide({ vdd: 3.3, rp: 4700, cb: 200e-12 }, 'fast')
    expect(slow.checks.filter((c) => !c.pass).map((c) => c.id)).toEqual(['rise'])
    const strong = i2cSide({ vdd: 3.3, rp: 470, cb: 200e-12 }, 'fast')
    expect(strong.checks.filter((c) => !c.pass).map((c) => c.id)).toEqual(['rp-min'])
  })

  it('checks an isolator\'s raised low level against the side\'s lowest VIL', () => {
    // timing-model.md section 4: the static offset of a bidirectional isolator against every device's VIL; VIL = 0.3 VDD (UM10204)
    expect(i2cSide({ vdd: 3.3, rp: 1500, cb: 100e-12, isolatorLowOffset: 0.8 }, 'fast').pass).toBe(true)
    const low = i2cSide({ vdd: 3.3, rp: 1500, cb: 100e-12, isolatorLowOffset: 0.8, vilMin: 0.7 }, 'fast')
    expect(low.checks.find((c) => c.id === 'offset-vil')!.pass).toBe(false)
  })
})

describe('the bus through the isolator', () => {
  // a Fast-mode bus: 1.5 kOhm and 100 pF on each side, an isolator of 30 ns (rising edges 10 ns slower), the mode's tVD;DAT
  const bus = {
    mode: 'fast' as const,
    a: { vdd: 3.3, rp: 1500, cb: 100e-12 },
    b: { vdd: 5, rp: 1500, cb: 100e-12 },
    isolator: { abFall: 30e-9, abRise: 40e-9, ba: 30e-9 },
    fScl: 400e3,
  }

  it('stretches the low the target sees by side a\'s rise to the threshold, the isolator\'s rise-fall difference and side b\'s rise to VIH', () => {
    const r = i2cBus(bus)
    // hand calculation from the RC edge (UM10204 section 7.1): ln 2 RC to 50 %, ln(1/0.3) RC to 70 %
    const stretch = Math.LN2 * 150e-9 + 10e-9 + Math.log(1 / 0.3) * 150e-9
    const d = 1.3 / 1.9 // UM10204 Table 10: tLOW 1.3 us, tHIGH 0.6 us (Fast-mode)
    expect(r.scl.lowA).toBeCloseTo(d * 2.5e-6, 15)
    expect(r.scl.lowB - r.scl.lowA).toBeCloseTo(stretch, 15)
    expect(r.scl.highB).toBeCloseTo(2.5e-6 - r.scl.lowB, 15)
    // the SDA round trip: 30 ns + tVD;DAT 0.9 us + 30 ns + ln(1/0.3) x 150 ns
    expect(r.roundTrip).toBeCloseTo(30e-9 + 0.9e-6 + 30e-9 + Math.log(1 / 0.3) * 150e-9, 15)
  })

  it('finds the highest SCL that meets every check, and each check holds there with no slack to spare', () => {
    const r = i2cBus(bus)
    const at = i2cBus({ ...bus, fScl: r.maxFScl })
    expect(at.checks.every((c) => c.slack >= -1e-15)).toBe(true)
    const limiting = at.checks.find((c) => c.id === r.limitedBy)!
    expect(Math.abs(limiting.slack)).toBeLessThan(1e-15)
    // a little faster breaks the limiting check
    expect(i2cBus({ ...bus, fScl: r.maxFScl * 1.01 }).checks.find((c) => c.id === r.limitedBy)!.pass).toBe(false)
    // a slower isolator (more delay both ways) never allows a faster clock
    expect(i2cBus({ ...bus, isolator: { abFall: 60e-9, abRise: 90e-9, ba: 60e-9 } }).maxFScl).toBeLessThanOrEqual(r.maxFScl)
  })

  it('fails the round trip when the target\'s data cannot reach the controller before its setup time', () => {
    const r = i2cBus({ ...bus, isolator: { abFall: 300e-9, abRise: 300e-9, ba: 300e-9 } })
    expect(r.checks.find((c) => c.id === 'sda-round-trip')!.pass).toBe(false)
    expect(r.pass).toBe(false)
    expect(r.maxFScl).toBeLessThan(400e3)
  })
})
