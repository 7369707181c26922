import { describe, expect, it } from 'vitest'
import { LinkSpec } from '../../../../shared/schemas/link'
import { ledCurrentOf } from '../../../../shared/utils/coupler'
import { applyCaptureToStage, delayCorners } from '../../../../shared/utils/capture-apply'
import { analyseCapture } from '../../../../server/captures/analyse'
import { parseCapture } from '../../../../server/captures/parse'
import { DEBUG_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { chunked, delayedEdges, nrzEdges, sampleWave, toCsv } from '../../../factories/captures'

async function couplerResult(tPLH: number, tPHL: number, inverting: boolean) {
  const bit = 1 / 9600
  const input = nrzEdges(40, bit, 20e-6, 9)
  const output = delayedEdges(input, { tPLH, tPHL, inverting })
  const dt = 100e-9
  const n = Math.ceil((40 * bit + 100e-6) / dt)
  const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 } })
  const vout = sampleWave(n, 0, dt, { edges: output, low: 0.2, high: 3.3, rise: { kind: 'exp', tau: 3e-6 }, fall: { kind: 'ramp', duration: 1e-6 }, noiseRms: 0.01 })
  return analyseCapture(await parseCapture(chunked(toCsv(0, dt, [vin, vout]))))
}

describe('apply a capture to a stage', () => {
  it('delay corners: typ = mean, min/max the wider of the extremes and mean -+ 3 sigma', () => {
    // timing-model.md 1: min/max are treated as +-3 sigma
    expect(delayCorners({ count: 10, min: 9e-6, mean: 10e-6, max: 11e-6, sigma: 0.1e-6 })).toEqual({ min: 9e-6, typ: 10e-6, max: 11e-6 })
    const wide = delayCorners({ count: 10, min: 9.9e-6, mean: 10e-6, max: 10.1e-6, sigma: 1e-6 })
    expect(wide.min).toBeCloseTo(7e-6, 12)
    expect(wide.max).toBeCloseTo(13e-6, 12)
    expect(delayCorners({ count: 3, min: 1e-9, mean: 2e-9, max: 3e-9, sigma: 5e-9 }).min).toBe(0)
  })

  it('a characterisation point at the measured RL and the board\'s conditions on the telemetry coupler; the spec stays valid', async () => {
    // timing-model.md 5 and 6: a point carries the conditions it was taken at (issue 11: LED current, load);
    // a capture is taken on the board, so at the stage's own LED current, load and supply
    const r = await couplerResult(22e-6, 3e-6, true)
    const spec = LinkSpec.parse(TELEMETRY_LINK)
    const before = spec.channels[0]!.stages[0]!
    if (before.kind !== 'phototransistor') throw new Error('the demo telemetry stage is a phototransistor')
    const applied = applyCaptureToStage(spec, { channel: 0, stage: 0 }, r, 'characterization', { rl: 4700 })
    const after = applied.spec.channels[0]!.stages[0]!
    if (after.kind !== 'phototransistor') throw new Error('kind changed')
    // the datasheet points were taken at other conditions: the board's point is added
    expect(after.characterization).toHaveLength(before.characterization.length + 1)
    const p = after.characterization.find((c) => c.rl === 4700 && c.vcc === before.vcc)!
    expect(Math.abs(p.tplh! - 22e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(p.tphl! - 3e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(p.tr! - 3e-6 * Math.log(9))).toBeLessThan(0.02 * 3e-6 * Math.log(9)) // references.md 5.2, 2 % as in the capture tests
    expect(p.loadCap).toBe(before.loadCap)
    expect(p.ledCurrent).toBeCloseTo(ledCurrentOf(before), 15)
    expect(applied.changes[0]).toBe('characterisation point added at RL 4700 ohm')
    expect(LinkSpec.safeParse(applied.spec).success).toBe(true)
    // the input is not modified
    expect(spec.channels[0]!.stages[0]).toEqual(before)
    // a second capture at the same RL and conditions replaces that point
    const again = applyCaptureToStage(applied.spec, { channel: 0, stage: 0 }, r, 'characterization', { rl: 4700 })
    const twice = again.spec.channels[0]!.stages[0]!
    if (twice.kind !== 'phototransistor') throw new Error('kind changed')
    expect(twice.characterization).toHaveLength(after.characterization.length)
    expect(again.changes[0]).toBe('characterisation point at RL 4700 ohm and these conditions replaced')
    // a new RL adds a point, kept in RL order
    const added = applyCaptureToStage(spec, { channel: 0, stage: 0 }, r, 'characterization', { rl: 2200 }).spec.channels[0]!.stages[0]!
    if (added.kind !== 'phototransistor') throw new Error('kind changed')
    expect(added.characterization.map((c) => c.rl)).toEqual([...before.characterization.map((c) => c.rl), 2200].sort((a, b) => a - b))
    expect(() => applyCaptureToStage(spec, { channel: 0, stage: 0 }, r, 'characterization', {})).toThrow('give the pull-up RL')
    expect(() => applyCaptureToStage(spec, { channel: 0, stage: 0 }, r, 'typical')).toThrow(/add a characterisation point instead/)
  })

  it('typical values and spread on a digital stage, with a warning when the inversion disagrees', async () => {
    // timing-model.md 6: "as its typical values and spread"
    const r = await couplerResult(8e-6, 5e-6, true)
    const spec = LinkSpec.parse(DEBUG_LINK)
    const applied = applyCaptureToStage(spec, { channel: 1, stage: 0 }, r, 'typical')
    const s = applied.spec.channels[1]!.stages[0]!
    if (s.kind !== 'digital') throw new Error('the debug stage is digital')
    expect(Math.abs(s.tplh.typ - 8e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(s.tphl.typ - 5e-6)).toBeLessThan(0.1e-6)
    expect(s.tplh.min).toBeLessThanOrEqual(s.tplh.typ)
    expect(s.tplh.max).toBeGreaterThanOrEqual(s.tplh.typ)
    expect(s.tr!.typ).toBeGreaterThan(5e-6)
    expect(LinkSpec.safeParse(applied.spec).success).toBe(true)
    expect(applied.spec.channels[0]).toEqual(spec.channels[0])
    if (!spec.channels[1]!.stages[0] || spec.channels[1]!.stages[0].kind !== 'digital') throw new Error('digital')
    const flipped = structuredClone(spec)
    const f = flipped.channels[1]!.stages[0]!
    if (f.kind === 'digital') f.inverting = false
    expect(applyCaptureToStage(flipped, { channel: 1, stage: 0 }, r, 'typical').warnings).toContain('the capture shows an inverting path but the stage is set non-inverting; check the wiring or the channels')
  })
})
