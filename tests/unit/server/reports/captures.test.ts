import { beforeAll, describe, expect, it } from 'vitest'
import { analyseCaptureStream, type CaptureResult } from '../../../../server/captures/analyse'
import { DEBUG_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { freezeCaptures, type CaptureSource } from '../../../../server/reports/captures'
import { parseLink } from '../../../../server/timing'
import type { Link } from '../../../../shared/schemas/link'
import { applyCaptureToStage } from '../../../../shared/utils/capture-apply'
import { couplerCapture } from '../../../factories/captures'

let result: CaptureResult
const link = (l: typeof TELEMETRY_LINK): Link => JSON.parse(JSON.stringify(parseLink(structuredClone(l))))
const source = (over: Partial<CaptureSource> = {}): CaptureSource => ({
  id: 5,
  label: 'coupler at 4.7k',
  fileName: 'scope.csv',
  sha256: 'ab'.repeat(32),
  size: '123456',
  options: { rl: 4700 },
  result,
  createdAt: new Date('2026-12-02T09:00:00.000Z'),
  owner: { id: 3, name: 'Test engineer' },
  ...over,
})

beforeAll(async () => {
  // the measured values go through JSON, as the capture row's JSONB holds them
  result = JSON.parse(JSON.stringify((await analyseCaptureStream([couplerCapture().text])).result))
})

describe('freezing the captures of a revision', () => {
  it('keeps the file, the channels and every measured statistic', () => {
    const [c] = freezeCaptures([source()], link(TELEMETRY_LINK))
    const p = result.pairing!
    expect(c).toMatchObject({ id: 5, label: 'coupler at 4.7k', fileName: 'scope.csv', size: 123456, uploadedBy: { id: 3, name: 'Test engineer' }, uploadedAt: '2026-12-02T09:00:00.000Z', rl: 4700, inverting: true })
    expect(c!.input).toEqual({ number: 1, name: 'TX pin (V)', tr: result.channels[0]!.tr, tf: result.channels[0]!.tf })
    expect(c!.output).toEqual({ number: 2, name: 'Coupler out (V)', tr: result.channels[1]!.tr, tf: result.channels[1]!.tf })
    expect(c!.tPLH).toEqual(p.tPLH)
    expect(c!.tPHL).toEqual(p.tPHL)
    expect(Math.abs(c!.tPLH!.mean - 22e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(c!.tPHL!.mean - 3e-6)).toBeLessThan(0.1e-6)
    // the stage still holds its datasheet values: nothing is claimed about an application
    expect(c!.appliedTo).toBeUndefined()
    // a snapshot, not a reference: no edge lists or waveform ride along
    expect(JSON.stringify(c)).not.toContain('edges')
  })

  it('names the stage when the frozen input holds the applied values, as a characterisation point or as typical values', () => {
    const tele = link(TELEMETRY_LINK)
    const point = applyCaptureToStage(tele, { channel: 0, stage: 0 }, result, 'characterization', { rl: 4700 }).spec
    expect(freezeCaptures([source()], point)[0]!.appliedTo).toEqual({ channelId: tele.channels[0]!.id, stageIndex: 0, stageName: tele.channels[0]!.stages[0]!.name, as: 'characterization' })
    // a point measured at another RL is not this capture's
    expect(freezeCaptures([source({ options: { rl: 10_000 } })], point)[0]!.appliedTo).toBeUndefined()

    const debug = link(DEBUG_LINK)
    const typical = applyCaptureToStage(debug, { channel: 1, stage: 0 }, result, 'typical').spec
    expect(freezeCaptures([source({ options: {} })], typical)[0]!.appliedTo).toEqual({ channelId: 'debug-rx', stageIndex: 0, stageName: debug.channels[1]!.stages[0]!.name, as: 'typical' })
    expect(freezeCaptures([source({ options: {} })], typical)[0]).not.toHaveProperty('rl')
  })

  it('skips captures without a result and orders the rest by id; an unpaired capture has no delays', () => {
    const single: CaptureResult = { ...result, pairing: null }
    const frozen = freezeCaptures([source({ id: 9 }), source({ id: 7, result: null }), source({ id: 2, result: single })], link(TELEMETRY_LINK))
    expect(frozen.map((c) => c.id)).toEqual([2, 9])
    expect(frozen[0]).toMatchObject({ output: null, inverting: null, tPLH: null, tPHL: null, input: { number: 1, name: 'TX pin (V)' } })
  })
})
