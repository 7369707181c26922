/**
 * CAN bit timing across isolated transceivers against published values (references.md
 * section 4): the propagation-segment rule and the oscillator-tolerance conditions with their
 * worked examples, the bus delay, and the longest bus against CAN-in-Automation practice.
 */
import { describe, expect, it } from 'vitest'
import { busDelay, canBitTimings, canMaxBusLength, loopDelay, oscillatorTolerance, propagationTime, propSegTq, type CanNodeDelays } from '../../../../server/timing/can'

const node = (driver: number, receiver: number, isolator = 0): CanNodeDelays => ({ isolatorTx: isolator, driver, receiver, isolatorRx: isolator })

describe('propagation segment', () => {
  it('covers twice the one-way delay between the two most distant nodes', () => {
    // TI DCAN TRM section 23.3.16.2.2 (after the Bosch C_CAN text): driver 60 ns, receiver 40 ns, 40 m of line 220 ns -> 640 ns -> Prop_Seg 7 tq at tq = 100 ns
    const a = node(60e-9, 40e-9)
    expect(propagationTime(a, a, 220e-9 / 5e-9, 5e-9)).toBeCloseTo(640e-9, 15)
    expect(propSegTq(640e-9, 100e-9)).toBe(7)
  })

  it('counts each node\'s isolator twice in the round trip, and the bus at 5 ns per metre', () => {
    // Microchip CAN FD module documentation: bus delay about 5 ns/m
    expect(busDelay(40)).toBeCloseTo(200e-9, 15)
    const isolated = node(60e-9, 40e-9, 25e-9)
    expect(loopDelay(isolated)).toBeCloseTo(150e-9, 15)
    // references.md 4.1: isolators add their delay to both output and input delays
    expect(propagationTime(isolated, isolated, 0) - propagationTime(node(60e-9, 40e-9), node(60e-9, 40e-9), 0)).toBeCloseTo(4 * 25e-9, 15)
    // the two nodes differ: the slower direction sets it
    expect(propagationTime(node(100e-9, 10e-9), node(10e-9, 10e-9), 0)).toBeCloseTo(2 * (100e-9 + 10e-9), 15)
  })
})

describe('oscillator tolerance', () => {
  it.each([
    // Bosch CAN specification 2.0 part B section 9 / TI DCAN TRM: best case 1.58 % (condition I), condition II 2.0 %
    [4, 4, 4, 10, 4 / 252, 0.02],
    // references.md 4.2 [D]: the formula evaluated
    [1, 1, 1, 10, 1 / 258, 0.005],
    [1, 2, 1, 10, 1 / 256, 0.005],
  ])('Phase_Seg1 %i, Phase_Seg2 %i, SJW %i, %i tq: I %f, II %f', (ps1, ps2, sjw, nbt, I, II) => {
    const t = oscillatorTolerance(ps1, ps2, sjw, nbt)
    expect(t.I).toBeCloseTo(I, 12)
    expect(t.II).toBeCloseTo(II, 12)
    expect(t.tolerance).toBe(Math.min(I, II))
  })

  it('gives 1.587 % and 0.388 % for the published best case and the high-rate example', () => {
    // references.md 4.2: "1.58 %"; high-rate example 0.1/(2 x (13 - 0.1)) = 0.388 % (not the printed 0.43 %)
    expect(oscillatorTolerance(4, 4, 4, 10).tolerance * 100).toBeCloseTo(1.587, 3)
    expect(oscillatorTolerance(1, 1, 1, 10).tolerance * 100).toBeCloseTo(0.3876, 4)
  })
})

describe('bit-timing table', () => {
  const isolated: [CanNodeDelays, CanNodeDelays] = [node(60e-9, 40e-9, 25e-9), node(60e-9, 40e-9, 25e-9)]

  it('lists only settings that give the bit rate exactly, each a whole bit of Sync + Prop + Phase1 + Phase2', () => {
    const rows = canBitTimings({ clockHz: 80e6, bitRate: 500e3, nodes: isolated, length: 20 })
    expect(rows.length).toBeGreaterThan(2)
    for (const r of rows) {
      expect(r.prescaler * r.tqPerBit * 500e3).toBeCloseTo(80e6, 6)
      expect(1 + r.propSeg + r.phaseSeg1 + r.phaseSeg2).toBe(r.tqPerBit)
      expect(r.sjw).toBeLessThanOrEqual(Math.min(r.phaseSeg1, r.phaseSeg2, 4))
      expect(r.samplePoint).toBeCloseTo((1 + r.propSeg + r.phaseSeg1) / r.tqPerBit, 12)
      // a setting "fits" exactly when its Prop_Seg covers the round trip
      expect(r.loopFits).toBe(r.propSeg * r.tq >= propagationTime(isolated[0], isolated[1], 20) - 1e-15)
    }
    expect(rows[0]!.loopFits).toBe(true)
  })

  it('says the loop delay does not fit when the bus is too long for the bit', () => {
    const rows = canBitTimings({ clockHz: 80e6, bitRate: 1e6, nodes: isolated, length: 200 })
    expect(rows.every((r) => !r.loopFits)).toBe(true)
  })

  it('the longest bus lies within the band of CAN-in-Automation practice at 1 Mbit/s and 125 kbit/s', () => {
    // references.md 4.4 (CiA/CANopen practice, band checks): 1 Mbit/s 25-40 m; 125 kbit/s 500 m
    const fast = canMaxBusLength({ clockHz: 80e6, bitRate: 1e6, nodes: isolated })!
    expect(fast).toBeGreaterThan(10)
    expect(fast).toBeLessThan(60)
    const slow = canMaxBusLength({ clockHz: 80e6, bitRate: 125e3, nodes: isolated })!
    expect(slow).toBeGreaterThan(250)
    expect(slow).toBeLessThan(750)
    // isolators shorten it: the same nodes without them reach farther
    expect(canMaxBusLength({ clockHz: 80e6, bitRate: 1e6, nodes: [node(60e-9, 40e-9), node(60e-9, 40e-9)] })!).toBeGreaterThan(fast)
  })
})
