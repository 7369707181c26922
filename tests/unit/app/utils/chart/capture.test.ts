import { describe, expect, it } from 'vitest'
import { captureGeometry } from '../../../../../app/utils/chart/capture'
import { analyseCapture } from '../../../../../server/captures/analyse'
import { parseCapture } from '../../../../../server/captures/parse'
import { chunked, delayedEdges, nrzEdges, sampleWave, toCsv } from '../../../../factories/captures'

describe('capture plot geometry', () => {
  it('one envelope per channel inside the plot area, state levels and 50 % marks at the right places', async () => {
    // common practice: the plot maps time to x and volts to y linearly; marks sit on the 50 % level
    const input = nrzEdges(20, 1e-4, 2e-5, 3)
    const output = delayedEdges(input, { tPLH: 2e-5, tPHL: 3e-6, inverting: true })
    const dt = 2e-7
    const n = Math.ceil((20 * 1e-4 + 1e-4) / dt)
    const a = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 1e-7 }, fall: { kind: 'ramp', duration: 1e-7 } })
    const b = sampleWave(n, 0, dt, { edges: output, low: 0.2, high: 5, rise: { kind: 'exp', tau: 4e-6 }, fall: { kind: 'ramp', duration: 1e-6 } })
    const parsed = await parseCapture(chunked(toCsv(0, dt, [a, b])), { displayBuckets: 200 })
    const result = analyseCapture(parsed)
    const frame = { width: 800, height: 300, margin: { top: 10, right: 10, bottom: 30, left: 50 } }
    const g = captureGeometry(frame, parsed.waveform, result)
    expect(g.traces.map((t) => t.name)).toEqual(['ch1', 'ch2'])
    for (const t of g.traces) {
      expect(t.band.startsWith('M')).toBe(true)
      expect(t.band).not.toMatch(/NaN/)
      for (const m of t.marks) {
        expect(m.x).toBeGreaterThanOrEqual(g.area.x0)
        expect(m.x).toBeLessThanOrEqual(g.area.x1)
      }
    }
    const out = g.traces[1]!
    // higher volts are higher on the screen (smaller y)
    expect(out.highY!).toBeLessThan(out.lowY!)
    expect(out.marks).toHaveLength(result.channels[1]!.edgeCount)
    // every mark sits on the channel's 50 % level, halfway between its state levels on screen
    for (const m of out.marks) expect(m.y).toBeCloseTo((out.highY! + out.lowY!) / 2, 6)
    // the first mark's x is its 50 % instant on the time axis
    const e = result.channels[1]!.edges[0]!
    const x = g.area.x0 + ((e.t50 - result.timeStart) / (result.timeEnd - result.timeStart)) * (g.area.x1 - g.area.x0)
    expect(out.marks[0]!.x).toBeCloseTo(x, 6)
    expect(g.xTicks.length).toBeGreaterThan(2)
    expect(g.yTicks.some((t) => t.label.includes('V'))).toBe(true)
  })
})
