/**
 * The I2C bus edges against ngspice transient runs over a grid of pull-ups, bus capacitances
 * and supplies: the rise through Rp (30 %-70 %) and the fall a driver sinking the mode's IOL
 * makes against the pull-up (70 %-30 %). The engine's fall takes a constant-current driver, the
 * slow case; a resistive driver that meets the same VOL at IOL falls faster in ngspice, so the
 * engine's figure is on the safe side of it.
 * ngspice is required: without it these tests fail with a plain message.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { requireNgspice, runMeasures } from '../../../../bench/ngspice-rc'
import { i2cFallTime, i2cRiseTime, i2cRpMin } from '../../../../server/timing/i2c'

const IOL = 3e-3 // UM10204 Table 10: VOL 0.4 V at 3 mA sink current (Standard and Fast mode)
const VOL = 0.4 // UM10204 Table 10
const RP = [1.5e3, 2.2e3, 4.7e3, 10e3]
const CB = [50e-12, 200e-12, 400e-12] // UM10204 Table 10: Cb up to 400 pF
const VDD = [3.3, 5]
const grid = VDD.flatMap((vdd) => RP.flatMap((rp) => CB.map((cb) => ({ vdd, rp, cb })))).filter((g) => g.rp >= i2cRpMin(g.vdd, VOL, IOL))

/**
 * One line on one supply: Rp from VDD, Cb to ground, released at t = 0 from 0 V (rise, node r);
 * a second copy starts at VDD and is pulled down from t = 0 (node f) by a current sink of IOL
 * that gives way linearly below VOL (an ideal constant-current output), a third (node g) by a
 * resistor VOL / IOL (the same output as a linear resistance).
 */
function netlist(g: { vdd: number; rp: number; cb: number }): string {
  const tau = g.rp * g.cb
  const step = tau / 4000
  const ron = VOL / IOL
  return [
    `* I2C line Rp=${g.rp} Cb=${g.cb} VDD=${g.vdd}`,
    `Vdd vdd 0 ${g.vdd}`,
    `R1 vdd r ${g.rp}`,
    `C1 r 0 ${g.cb} IC=0`,
    `R2 vdd f ${g.rp}`,
    `C2 f 0 ${g.cb} IC=${g.vdd}`,
    `B2 f 0 I = ${IOL} * min(1, max(v(f), 0) / ${VOL})`,
    `R3 vdd g ${g.rp}`,
    `C3 g 0 ${g.cb} IC=${g.vdd}`,
    `R4 g 0 ${ron}`,
    `.tran ${step} ${6 * tau} 0 ${step} uic`,
    `.meas tran r30 WHEN v(r)=${0.3 * g.vdd} RISE=1`,
    `.meas tran r70 WHEN v(r)=${0.7 * g.vdd} RISE=1`,
    `.meas tran f70 WHEN v(f)=${0.7 * g.vdd} FALL=1`,
    `.meas tran f30 WHEN v(f)=${0.3 * g.vdd} FALL=1`,
    `.meas tran g70 WHEN v(g)=${0.7 * g.vdd} FALL=1`,
    `.meas tran g30 WHEN v(g)=${0.3 * g.vdd} FALL=1`,
    '.end',
    '',
  ].join('\n')
}

let runs: { values: Map<string, number>; output: string }[] = []
beforeAll(() => {
  requireNgspice()
  runs = runMeasures(grid.map(netlist))
}, 120_000)

const measured = (i: number, name: string): number => {
  const v = runs[i]!.values.get(name)
  if (v === undefined) throw new Error(`ngspice gave no ${name} for case ${i}:\n${runs[i]!.output}`)
  return v
}

// agreement: ngspice's step is held below Rp Cb / 4000
const TOL = 2e-3

describe('I2C bus edges against ngspice', () => {
  it('the grid holds every pull-up the mode allows on both supplies', () => {
    expect(grid.length).toBeGreaterThanOrEqual(21)
  })

  it.each(grid.map((g, i) => [g.rp, g.cb, g.vdd, i] as const))('Rp %s ohm, Cb %s F, VDD %s V: rise 30 %%-70 %% = 0.8473 Rp Cb', (rp, cb, _vdd, i) => {
    // UM10204 section 7.1: tr = 0.8473 x Rp x Cb between 0.3 VDD and 0.7 VDD
    const spice = measured(i, 'r70') - measured(i, 'r30')
    expect(Math.abs(i2cRiseTime(rp, cb) - spice)).toBeLessThanOrEqual(TOL * rp * cb)
  })

  it.each(grid.map((g, i) => [g.rp, g.cb, g.vdd, i] as const))('Rp %s ohm, Cb %s F, VDD %s V: fall 70 %%-30 %% with a 3 mA sink', (rp, cb, vdd, i) => {
    const spice = measured(i, 'f30') - measured(i, 'f70')
    const engine = i2cFallTime({ vdd, rp, cb }, IOL)
    expect(Number.isFinite(engine)).toBe(true)
    // the same constant-current driver: the closed form and the transient agree
    expect(Math.abs(engine - spice)).toBeLessThanOrEqual(TOL * rp * cb)
    // a resistive output meeting the same VOL at IOL is faster: the engine's figure is the slow (safe) side
    const resistive = measured(i, 'g30') - measured(i, 'g70')
    expect(engine).toBeGreaterThanOrEqual(resistive)
  })

  it('a driver that cannot hold the line below 0.3 VDD against the pull-up gives no finite fall', () => {
    // the pull-up alone feeds 0.7 VDD / Rp at 0.3 VDD: a 3 mA sink cannot beat 3.5 V / 1 kOhm
    expect(i2cFallTime({ vdd: 5, rp: 1e3, cb: 100e-12 }, IOL)).toBe(Number.POSITIVE_INFINITY)
  })
})
