import { describe, expect, it } from 'vitest'
import { clipPoints, edgePoints, lanePoints, levelsOf, uartTimelineGeometry, type LaneInput } from '../../../../../app/utils/chart/timeline'
import { uartMarginState } from '../../../../../shared/report/vocabulary'

const ideal: LaneInput = { name: 'tx', inverted: false, edges: { rise: 0, fall: 0, tr: 0, tf: 0, riseShape: 'ramp', fallShape: 'ramp' } }

describe('levelsOf', () => {
  it("reads the engine's level mask cell by cell (bit j: cell j)", () => {
    expect(levelsOf(0b1000000010, 10)).toEqual([0, 1, 0, 0, 0, 0, 0, 0, 0, 1])
    expect(levelsOf(0, 3)).toEqual([0, 0, 0])
  })
})

describe('edgePoints', () => {
  it('draws a ramp through 50 % at its centre spanning tr / 0.8', () => {
    const p = edgePoints(10, true, 8, 'ramp', 100)
    expect(p).toEqual([[5, 0], [15, 1]])
  })
  it('draws an RC edge that crosses 50 % at its centre and 90 % at 10 % + tr', () => {
    const tr = 2.197
    const p = edgePoints(0, true, tr, 'exponential', 100)
    const at = (t: number) => {
      const i = p.findIndex((q) => q[0] >= t)
      const [t0, v0] = p[i - 1]!
      const [t1, v1] = p[i]!
      return v0 + ((v1 - v0) * (t - t0)) / (t1 - t0)
    }
    expect(at(0)).toBeCloseTo(0.5, 1)
    expect(p[0]![1]).toBe(0)
    expect(p.at(-1)![1]).toBeGreaterThan(0.99)
  })
  it('stops an edge where the next one begins', () => {
    const p = edgePoints(0, false, 10, 'ramp', 2)
    expect(p.at(-1)![0]).toBe(2)
    expect(p.at(-1)![1]).toBeGreaterThan(0)
  })
})

describe('lanePoints', () => {
  it('moves rising and falling edges by their own delays and inverts the level', () => {
    const lane: LaneInput = { name: 'rx', inverted: true, edges: { rise: 3, fall: 1, tr: 0, tf: 0, riseShape: 'ramp', fallShape: 'ramp' } }
    const pts = lanePoints([0, 1, 1], 10, lane, -5, 40)
    // idle high logically = low physically; the start bit (logical fall) is a physical rise at 0 + 3
    expect(pts[0]).toEqual([-5, 0])
    expect(pts).toContainEqual([3, 1])
    // the d0 = 1 boundary at 10 is a physical fall, delayed by 1
    expect(pts).toContainEqual([11, 0])
    expect(pts.every((p, i) => i === 0 || p[0] >= pts[i - 1]![0])).toBe(true)
  })
})

describe('uartTimelineGeometry', () => {
  const T = 1e-4
  const bits = [
    { index: 0, label: 'start', marginUi: 0.3, earlyMargin: 3e-5, lateMargin: 3e-5, samples: { earliest: 5e-5, latest: 6e-5 }, validFrom: 2e-5, validTo: 9e-5 },
    { index: 1, label: 'd0', marginUi: -0.2, earlyMargin: 1e-5, lateMargin: -2e-5, samples: { earliest: 1.5e-4, latest: 1.6e-4 }, validFrom: 1.4e-4, validTo: 1.4e-4 + 0 },
  ]
  const g = uartTimelineGeometry({ bitTime: T, frameBits: 3, levels: [0, 1, 1], backToBack: true, lanes: [ideal, ideal], sync: 0, bits, requiredUi: 0.1, width: 800 })

  it('lays out one lane per input with a path and the frame cells inside the plot', () => {
    expect(g.lanes).toHaveLength(2)
    expect(g.lanes[0]!.path.startsWith('M')).toBe(true)
    expect(g.lanes[1]!.y).toBeGreaterThan(g.lanes[0]!.y)
    for (const c of g.cells) {
      expect(c.x0).toBeGreaterThanOrEqual(g.plot.x0)
      expect(c.x1).toBeLessThanOrEqual(g.plot.x1)
    }
    expect(g.height).toBeGreaterThan(g.windowRow)
  })

  it('marks a bit broken and hatches where its samples fall outside the window', () => {
    expect(g.windows.map((w) => w.state)).toEqual(['healthy', 'broken'])
    expect(g.windows[0]!.overlaps).toEqual([])
    expect(g.windows[1]!.overlaps).toHaveLength(1)
    expect(g.windows[1]!.s1).toBeGreaterThan(g.windows[1]!.x1)
  })

  it('zooms to one bit: the domain spans a little more than that bit', () => {
    const z = uartTimelineGeometry({ bitTime: T, frameBits: 3, levels: [0, 1, 1], backToBack: true, lanes: [ideal], sync: 0, bits, requiredUi: 0.1, width: 800, zoomBit: 1 })
    expect(z.domain[0]).toBeCloseTo(0.3 * T, 12)
    expect(z.domain[1]).toBeCloseTo(2.7 * T, 12)
  })

  it('classifies margins against zero and the required margin, and the guard band when the team sets one', () => {
    expect(uartMarginState(-0.01, 0.1)).toBe('broken')
    expect(uartMarginState(0.05, 0.1)).toBe('thin')
    expect(uartMarginState(0.1, 0.1)).toBe('healthy')
    expect(uartMarginState(0.12, 0.1, { guardBandUi: 0.05, thinSlackFraction: 0 })).toBe('thin')
    expect(uartMarginState(0.16, 0.1, { guardBandUi: 0.05, thinSlackFraction: 0 })).toBe('healthy')
  })

  it('zoomed to one bit, a lane that holds its level across the view is drawn level, not as a ramp (issue 17)', () => {
    const slow: LaneInput = { name: 'rx', inverted: false, edges: { rise: 0.2 * T, fall: 0.1 * T, tr: 0, tf: 0, riseShape: 'ramp', fallShape: 'ramp' } }
    // start 0, d0..d7 = 1 (0xFF), stop 1: the lane is high from d0 on; zoomed to d3 it is one flat line
    const levels = levelsOf(0b1111111110, 10)
    const z = uartTimelineGeometry({ bitTime: T, frameBits: 10, levels, backToBack: false, lanes: [slow], sync: 0, bits, requiredUi: 0.1, width: 800, zoomBit: 4 })
    const ys = [...z.lanes[0]!.path.matchAll(/[ML]([\d.]+),([\d.]+)/g)].map((m) => Number(m[2]))
    expect(new Set(ys).size).toBe(1)
    expect(ys[0]).toBe(z.lanes[0]!.y)
  })
})

describe('zoom with edges on both sides of the view', () => {
  it('keeps every edge in order: an ideal lane zoomed to a bit is only levels and vertical steps at the two levels (issue 17)', () => {
    const T = 1e-4
    const ideal2: LaneInput = { name: 'tx', inverted: false, edges: { rise: 0, fall: 0, tr: 0, tf: 0, riseShape: 'ramp', fallShape: 'ramp' } }
    const bits = [{ index: 4, label: 'd3', marginUi: 0.3, earlyMargin: 3e-5, lateMargin: 3e-5, samples: { earliest: 4.5e-4, latest: 4.6e-4 }, validFrom: 4e-4, validTo: 5e-4 }]
    // 0x55: start 0, then 1 0 1 0 1 0 1 0, stop 1: an edge at every boundary
    const levels = levelsOf(0b1010101010, 10)
    const whole = uartTimelineGeometry({ bitTime: T, frameBits: 10, levels, backToBack: false, lanes: [ideal2], sync: 0, bits, requiredUi: 0.1, width: 800 })
    const z = uartTimelineGeometry({ bitTime: T, frameBits: 10, levels, backToBack: false, lanes: [ideal2], sync: 0, bits, requiredUi: 0.1, width: 800, zoomBit: 4 })
    const pts = (d: string) => [...d.matchAll(/[ML]([\d.]+),([\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])])
    const zp = pts(z.lanes[0]!.path)
    const ys = new Set(pts(whole.lanes[0]!.path).map((p) => p[1]))
    expect(zp.every((p) => ys.has(p[1]!))).toBe(true)
    for (let i = 1; i < zp.length; i++) expect(zp[i]![0] === zp[i - 1]![0] || zp[i]![1] === zp[i - 1]![1]).toBe(true)
    expect(zp.every((p, i) => i === 0 || p[0]! >= zp[i - 1]![0]!)).toBe(true)
    // the view holds the edges at 4T and 5T: four vertical steps' ends
    expect(zp.filter((p, i) => i > 0 && p[0] === zp[i - 1]![0]).length).toBeGreaterThanOrEqual(2)
  })
})

describe('clipPoints', () => {
  it('interpolates the level at both ends of the view and keeps the points inside', () => {
    const pts: [number, number][] = [[0, 0], [10, 0], [12, 1], [30, 1], [31, 0], [50, 0]]
    expect(clipPoints(pts, 11, 20)).toEqual([[11, 0.5], [12, 1], [20, 1]])
    expect(clipPoints(pts, 14, 20)).toEqual([[14, 1], [20, 1]])
  })
})
