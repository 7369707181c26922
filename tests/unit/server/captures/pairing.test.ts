import { describe, expect, it } from 'vitest'
import { analyseCapture, analyseCaptureStream } from '../../../../server/captures/analyse'
import { parseCapture } from '../../../../server/captures/parse'
import { chunked, delayedEdges, nrzEdges, sampleWave, toCsv, type EdgeShape, type SynthEdge } from '../../../factories/captures'

const BIT = 1 / 38400 // s, the demo telemetry rate

interface Scenario {
  tPLH: number
  tPHL: number
  inverting: boolean
  rise: EdgeShape
  fall: EdgeShape
  noiseRms: number
  jitterRms?: number
  drop?: number // index of an output edge to remove
}

/** A two-channel capture (input pin, coupler output) as CSV text, and its true edges. */
function capture(s: Scenario, dt = 50e-9, bits = 200, bit = BIT) {
  const input = nrzEdges(bits, bit, 0.8 * bit, 42) // the first edge 0.8 bit into the record
  let output: SynthEdge[] = delayedEdges(input, { tPLH: s.tPLH, tPHL: s.tPHL, inverting: s.inverting, jitterRms: s.jitterRms, seed: 5 })
  if (s.drop !== undefined) output = output.filter((_, i) => i !== s.drop)
  const n = Math.ceil((bits + 3) * bit / dt) // three idle bits after the last one
  const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 }, noiseRms: 0.01, seed: 1 })
  const vout = sampleWave(n, 0, dt, { edges: output, low: 0.15, high: 3.3, rise: s.rise, fall: s.fall, noiseRms: s.noiseRms, seed: 2 })
  const text = toCsv(0, dt, [vin, vout], { header: ['Time (s),TX pin (V),Coupler out (V)'] })
  return { text, input, output }
}

const COUPLER: Scenario = {
  // an invented 20 %-CTR phototransistor coupler with a 4.7 kOhm pull-up: slow passive rise, fast fall, inverting
  tPLH: 18e-6,
  tPHL: 3e-6,
  inverting: true,
  rise: { kind: 'exp', tau: 2e-6 }, // tr = 2.197 tau = 4.39 us (references.md 5.2)
  fall: { kind: 'ramp', duration: 0.8e-6 },
  noiseRms: 0.02,
}

describe('input/output pairing: tPLH and tPHL', () => {
  it('an inverting coupler: inversion detected, tPLH and tPHL by the output direction, tr and tf', async () => {
    // timing-model.md 1 and 6 (JEDEC: named by the output's direction); tolerances: common practice,
    // 50 % instants interpolated between 50 ns samples are good to a few ns without jitter
    const { text, input } = capture(COUPLER)
    const r = analyseCapture(await parseCapture(chunked(text)))
    const p = r.pairing!
    expect(p.inversionSource).toBe('detected')
    expect(p.inverting).toBe(true)
    expect(p.inversionAgreement).toBe(1)
    expect(p.unpairedInputEdges).toBe(0)
    expect(p.pairCount).toBe(input.length)
    const rising = input.filter((e) => e.polarity === 'falling').length // an input fall makes an output rise
    expect(p.tPLH!.count).toBe(rising)
    expect(p.tPHL!.count).toBe(input.length - rising)
    expect(Math.abs(p.tPLH!.mean - 18e-6)).toBeLessThan(20e-9)
    expect(Math.abs(p.tPHL!.mean - 3e-6)).toBeLessThan(20e-9)
    // per-edge spread from the 20 mV noise on the slow rise: 20 mV / (0.79 V/us at 50 %) = 25 ns rms
    expect(p.tPLH!.sigma).toBeGreaterThan(15e-9)
    expect(p.tPLH!.sigma).toBeLessThan(40e-9)
    expect(p.tPHL!.sigma).toBeLessThan(15e-9) // the fast fall: 20 mV / (3.15 V / 1 us) = 6 ns rms per sample, two samples interpolated
    expect(p.pwd!).toBeCloseTo(15e-6, 7)
    // output transition durations: exponential rise tau ln 9 (references.md 5.2 [D]); 2 % as in transitions.test.ts
    const out = r.channels[1]!
    expect(out.name).toBe('Coupler out (V)')
    expect(Math.abs(out.tr!.mean - 2.1972246 * 2e-6)).toBeLessThan(0.02 * 2.1972246 * 2e-6)
    expect(Math.abs(out.tf!.mean - 0.8e-6)).toBeLessThan(20e-9) // common practice: ramp, exact but for the noise
    expect(out.levels!.low).toBeCloseTo(0.15, 2)
    expect(out.levels!.high).toBeCloseTo(3.3, 2)
    // the input's 20 ns edges are shorter than the 50 ns sample interval: reported, but flagged
    expect(r.channels[0]!.tr!.mean).toBeLessThan(100e-9)
    expect(r.warnings).toContain('channel "TX pin (V)": transition durations are within 2 sample intervals, so they are limited by the sampling, not measured')
    expect(r.warnings.filter((w) => w.includes('Coupler out'))).toEqual([])
  })

  it('a non-inverting digital isolator: detected as non-inverting, and sigma follows the jitter', async () => {
    // common practice: 60 ns / 45 ns delays with 5 ns rms jitter; the sample sigma of ~100 values is within 25 % of it
    const s: Scenario = { tPLH: 60e-9, tPHL: 45e-9, inverting: false, rise: { kind: 'ramp', duration: 4e-9 }, fall: { kind: 'ramp', duration: 4e-9 }, noiseRms: 0.02, jitterRms: 5e-9 }
    const { text } = capture(s, 1e-9, 120, 1e-6) // 1 Mbit/s, 1 ns samples
    const p = analyseCapture(await parseCapture(chunked(text))).pairing!
    expect(p.inverting).toBe(false)
    expect(p.tPLH!.count + p.tPHL!.count).toBeGreaterThan(10)
    expect(Math.abs(p.tPLH!.mean - 60e-9)).toBeLessThan(4e-9)
    expect(Math.abs(p.tPHL!.mean - 45e-9)).toBeLessThan(4e-9)
    expect(p.tPLH!.sigma).toBeGreaterThan(2.5e-9)
    expect(p.tPLH!.sigma).toBeLessThan(8e-9)
    expect(p.tPLH!.min).toBeLessThan(p.tPLH!.mean)
    expect(p.tPLH!.max).toBeGreaterThan(p.tPLH!.mean)
  })

  it('a missing output pulse leaves its two input edges unpaired and does not shift the others', async () => {
    // common practice: pairing stops at the next input edge of the same direction. Removing one
    // output edge of a two-level signal removes the following one too (the level never changes)
    const { text, input } = capture({ ...COUPLER, drop: 10 })
    const r = analyseCapture(await parseCapture(chunked(text)), { inverting: true })
    const p = r.pairing!
    expect(p.inversionSource).toBe('given')
    expect(p.unpairedInputEdges).toBe(2)
    expect(p.pairCount).toBe(input.length - 2)
    // no pair is shifted onto a later edge (that would be 26 us off): all within 5 noise sigma
    expect(p.tPLH!.max).toBeLessThan(18.15e-6)
    expect(p.tPHL!.max).toBeLessThan(3.08e-6)
    expect(p.tPLH!.min).toBeGreaterThan(17.85e-6)
    expect(p.tPHL!.min).toBeGreaterThan(2.92e-6)
    expect(r.warnings.some((w) => w.includes('2 input edge(s) had no output edge'))).toBe(true)
  })

  it('the output channel can be chosen; a missing one is refused with a clear message', async () => {
    // common practice
    const { text } = capture(COUPLER, 100e-9, 30)
    const parsed = await parseCapture(chunked(text))
    expect(analyseCapture(parsed, { output: null }).pairing).toBeNull()
    const swapped = analyseCapture(parsed, { input: 1, output: 0 }).pairing!
    expect(swapped.input).toBe(1)
    expect(() => analyseCapture(parsed, { output: 2 })).toThrow('the output channel 3 does not exist: the capture has 2 voltage columns')
  })

  it('end to end from a stream: result and display waveform, JSON-safe', async () => {
    // common practice: what the job stores must survive JSON (no NaN, no Infinity)
    const { text } = capture(COUPLER)
    const { result, waveform } = await analyseCaptureStream(chunked(text, [4096]), { displayBuckets: 1000 })
    expect(waveform.channels).toHaveLength(2)
    expect(waveform.t.length).toBeLessThanOrEqual(1000)
    expect(waveform.t.length).toBeGreaterThanOrEqual(500)
    expect(Math.max(...waveform.channels[1]!.max)).toBeGreaterThan(3.2)
    const json = JSON.stringify(result)
    expect(json).not.toMatch(/NaN|Infinity|null,"t90"/)
    expect(JSON.parse(json)).toEqual(result)
    expect(result.sampleInterval).toBeCloseTo(50e-9, 12)
  })
})
