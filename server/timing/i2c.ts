/**
 * I2C through a bidirectional isolator, one side of the bus at a time (timing-model.md
 * section 4, "I2C"; NXP UM10204, I2C-bus specification and user manual): the open-drain
 * rise time against the mode, the pull-up range, the bus capacitance, and the static low
 * offset some bidirectional isolators put on one side against that side's VIL. The round
 * trip of SDA through the isolator and the maximum SCL frequency build on these.
 */
import type { I2cMode, I2cSideInput, I2cSideResult } from '../../shared/types/analysis'
import { EngineInputError } from './errors'
import { seriesValues, type SeriesName } from './eseries'

export type { I2cMode, I2cSideInput, I2cSideResult }

/** The 30 %-70 % rise of an RC edge in units of RC: t(0.7) - t(0.3) = ln(0.7 / 0.3) = 0.8473 (UM10204 section 7.1). */
export const RISE_30_70 = Math.log(7 / 3)

/** Mode limits, UM10204 Table 10 (characteristics of the SDA and SCL bus lines), seconds, farads, amperes, hertz. */
export const I2C_MODES: Record<I2cMode, { fSclMax: number; riseMax: number; fallMax: number; cbMax: number; iol: number; tLow: number; tHigh: number; tSuDat: number }> = {
  standard: { fSclMax: 100e3, riseMax: 1000e-9, fallMax: 300e-9, cbMax: 400e-12, iol: 3e-3, tLow: 4.7e-6, tHigh: 4.0e-6, tSuDat: 250e-9 },
  fast: { fSclMax: 400e3, riseMax: 300e-9, fallMax: 300e-9, cbMax: 400e-12, iol: 3e-3, tLow: 1.3e-6, tHigh: 0.6e-6, tSuDat: 100e-9 },
  'fast-plus': { fSclMax: 1e6, riseMax: 120e-9, fallMax: 120e-9, cbMax: 550e-12, iol: 20e-3, tLow: 0.5e-6, tHigh: 0.26e-6, tSuDat: 50e-9 },
}

/** 30 %-70 % rise time of an open-drain line: 0.8473 Rp Cb (UM10204 section 7.1). */
export function i2cRiseTime(rp: number, cb: number): number {
  return RISE_30_70 * rp * cb
}

/** Rp(max) = tr / (0.8473 Cb) (UM10204 section 7.1). */
export function i2cRpMax(riseMax: number, cb: number): number {
  if (!(cb > 0)) throw new EngineInputError(['cb'], 'the bus capacitance must be positive')
  return riseMax / (RISE_30_70 * cb)
}

/** Rp(min) = (VDD - VOL(max)) / IOL (UM10204 section 7.1). */
export function i2cRpMin(vdd: number, vol: number, iol: number): number {
  if (!(iol > 0)) throw new EngineInputError(['iol'], 'the sink current must be positive')
  return (vdd - vol) / iol
}

/**
 * The 70 %-30 % fall of a line a driver pulls down: the bus capacitance discharged by the driver's
 * sink current (at least the mode's IOL once above VOL, UM10204 Table 10) less what the pull-up
 * feeds in, (VDD - v) / Rp. Integrating Cb dv / (IOL - (VDD - v) / Rp) from 0.7 VDD to 0.3 VDD:
 * tf = Rp Cb ln((IOL - 0.3 VDD / Rp) / (IOL - 0.7 VDD / Rp)); infinite when the driver cannot
 * pull the line below 0.3 VDD. Common practice: a constant-current driver, the slow case (a real
 * output sinks more above VOL); checked against ngspice in tests/unit/server/timing/i2c-spice.test.ts.
 */
export function i2cFallTime(side: { vdd: number; rp: number; cb: number }, iol: number): number {
  const atStart = iol - (0.3 * side.vdd) / side.rp
  const atEnd = iol - (0.7 * side.vdd) / side.rp
  return atEnd > 0 ? side.rp * side.cb * Math.log(atStart / atEnd) : Number.POSITIVE_INFINITY
}

/** VOL(max) of the mode's drivers: 0.4 V at the mode's sink current for VDD above 2 V, 0.2 VDD at 2 V or less (UM10204 Table 10). */
export function i2cVolMax(vdd: number): number {
  return vdd > 2 ? 0.4 : 0.2 * vdd
}

/** One side of the bus against the mode. */
export function i2cSide(side: I2cSideInput, mode: I2cMode): I2cSideResult {
  if (!(side.vdd > 0)) throw new EngineInputError(['vdd'], 'the side\'s supply must be positive')
  if (!(side.rp > 0)) throw new EngineInputError(['rp'], 'the pull-up must be positive')
  if (!(side.cb > 0)) throw new EngineInputError(['cb'], 'the bus capacitance must be positive')
  const m = I2C_MODES[mode]
  const vol = side.vol ?? i2cVolMax(side.vdd)
  const rise = i2cRiseTime(side.rp, side.cb)
  const rpMin = i2cRpMin(side.vdd, vol, m.iol)
  const rpMax = i2cRpMax(m.riseMax, side.cb)
  const vil = side.vilMin ?? 0.3 * side.vdd
  const offsetLow = side.isolatorLowOffset === undefined ? null : side.isolatorLowOffset
  const checks: I2cSideResult['checks'] = [
    { id: 'rise', pass: rise <= m.riseMax, text: `rise ${(rise * 1e9).toFixed(0)} ns against the mode's ${(m.riseMax * 1e9).toFixed(0)} ns` },
    { id: 'rp-min', pass: side.rp >= rpMin, text: `Rp ${side.rp} ohm against Rp(min) ${rpMin.toFixed(0)} ohm at ${(m.iol * 1e3).toFixed(0)} mA` },
    { id: 'capacitance', pass: side.cb <= m.cbMax, text: `Cb ${(side.cb * 1e12).toFixed(0)} pF against the mode's ${(m.cbMax * 1e12).toFixed(0)} pF` },
  ]
  if (offsetLow !== null) checks.push({ id: 'offset-vil', pass: offsetLow < vil, text: `the isolator's low ${offsetLow} V against the lowest VIL ${vil.toFixed(2)} V on this side` })
  return { rise, riseMax: m.riseMax, rpMin, rpMax, offsetLow, checks, pass: checks.every((c) => c.pass) }
}

/** Every pull-up of an E series between Rp(min) and Rp(max) of the side (empty when the range is empty). */
export function i2cPullupChoices(side: Omit<I2cSideInput, 'rp'>, mode: I2cMode, series: SeriesName): number[] {
  const m = I2C_MODES[mode]
  const lo = i2cRpMin(side.vdd, side.vol ?? i2cVolMax(side.vdd), m.iol)
  const hi = i2cRpMax(m.riseMax, side.cb)
  return lo <= hi ? seriesValues(series, lo, hi) : []
}

/** tVD;DAT (max) of the modes, seconds (UM10204 Table 10; from memory: Sm 3.45 us, Fm 0.9 us, Fm+ 0.45 us). */
export const I2C_TVDDAT: Record<I2cMode, number> = { standard: 3.45e-6, fast: 0.9e-6, 'fast-plus': 0.45e-6 }

/** Time for an RC line released from low to reach a fraction of VDD: -ln(1 - fraction) R C. */
const riseTo = (fraction: number, rp: number, cb: number) => -Math.log(1 - fraction) * rp * cb

/**
 * An isolated I2C bus at the controller's SCL (timing-model.md section 4): SCL as the target
 * sees it (the low stretched by the slow rise on side a to the isolator's threshold, the isolator's
 * rise-fall delay difference, and side b's rise to VIH), the SDA round trip (SCL through the isolator,
 * the target's tVD;DAT, SDA back, side a's rise to VIH) against the controller's low less tSU;DAT, and
 * the highest SCL frequency meeting all of them at the same duty.
 */
export function i2cBus(i: I2cBusInput): I2cBusResult {
  if (!(i.fScl > 0)) throw new EngineInputError(['fScl'], 'the SCL frequency must be positive')
  const m = I2C_MODES[i.mode]
  const d = i.dutyLow ?? m.tLow / (m.tLow + m.tHigh)
  if (!(d > 0 && d < 1)) throw new EngineInputError(['dutyLow'], 'the SCL low time is a fraction of the period between 0 and 1')
  const th = i.isolator.threshold ?? 0.5
  // what the target's low gains over the controller's: side a's rise to the isolator threshold, the isolator's rise delay over its fall delay, side b's rise to VIH (0.7 VDD)
  const stretch = riseTo(th, i.a.rp, i.a.cb) + i.isolator.abRise - i.isolator.abFall + riseTo(0.7, i.b.rp, i.b.cb)
  // SCL falls at a -> crosses -> the target drives SDA within tVD;DAT -> crosses back -> a rising SDA reaches VIH on side a
  const roundTrip = i.isolator.abFall + (i.tVdDat ?? I2C_TVDDAT[i.mode]) + i.isolator.ba + riseTo(0.7, i.a.rp, i.a.cb)
  const T = 1 / i.fScl
  const lowA = d * T
  const highA = T - lowA
  const lowB = lowA + stretch
  const highB = T - lowB
  const check = (id: I2cCheckId, value: number, limit: number) => ({ id, value, limit, slack: value - limit, pass: value >= limit })
  const checks = [
    check('mode-frequency', m.fSclMax, i.fScl),
    check('controller-low', lowA, m.tLow),
    check('controller-high', highA, m.tHigh),
    check('target-low', lowB, m.tLow),
    check('target-high', highB, m.tHigh),
    check('sda-round-trip', lowA - m.tSuDat, roundTrip),
  ]
  // the shortest period each check allows at duty d
  const periods: [I2cCheckId, number][] = [
    ['mode-frequency', 1 / m.fSclMax],
    ['controller-low', m.tLow / d],
    ['controller-high', m.tHigh / (1 - d)],
    ['target-low', (m.tLow - stretch) / d],
    ['target-high', (m.tHigh + stretch) / (1 - d)],
    ['sda-round-trip', (roundTrip + m.tSuDat) / d],
  ]
  const [limitedBy, period] = periods.reduce((x, y) => (y[1] > x[1] ? y : x))
  const sides = { a: i2cSide(i.a, i.mode), b: i2cSide(i.b, i.mode) }
  return { sides, scl: { lowA, highA, lowB, highB }, roundTrip, checks, pass: checks.every((c) => c.pass) && sides.a.pass && sides.b.pass, maxFScl: 1 / period, limitedBy }
}
