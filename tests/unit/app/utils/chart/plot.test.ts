import { describe, expect, it } from 'vitest'
import { extent, linearTicks, logTicks } from '../../../../../app/utils/chart/axis'
import { histogramGeometry, pullupSweepGeometry, rateSweepGeometry, seriesPath } from '../../../../../app/utils/chart/plot'
import { spiTimelineGeometry, throughChannel } from '../../../../../app/utils/chart/spiTimeline'

const frame = { width: 600, height: 240, margin: { top: 10, right: 20, bottom: 30, left: 50 } }

describe('axes', () => {
  it('label linear ticks in engineering notation and place them in the range', () => {
    const t = linearTicks([0, 20e-6], [0, 100], 4, 's')
    expect(t[0]).toMatchObject({ value: 0, pos: 0, label: '0 s' })
    expect(t.at(-1)).toMatchObject({ pos: 100, label: '20 µs' })
  })
  it('put log ticks on decades within the domain', () => {
    const t = logTicks([1000, 100000], [0, 200], 6, 'Bd')
    expect(t.map((x) => x.label)).toContain('10 kBd')
    expect(t[0]!.pos).toBe(0)
    expect(t.every((x) => x.pos >= 0 && x.pos <= 200)).toBe(true)
  })
  it('pads an extent and ignores non-finite values', () => {
    expect(extent([0, 10, null, Number.NaN], 0.1)).toEqual([-1, 11])
    expect(extent([], 0.1)).toEqual([0, 1])
    expect(extent([5], 0)).toEqual([4.5, 5.5])
  })
})

describe('seriesPath', () => {
  it('breaks the line at missing values', () => {
    const s = seriesPath([{ x: 0, y: 0 }, { x: 1, y: null }, { x: 2, y: 1 }, { x: 3, y: 2 }], (v) => v * 10, (v) => 100 - v)
    expect(s.points).toHaveLength(3)
    expect(s.path.match(/M/g)).toHaveLength(2)
  })
})

describe('rateSweepGeometry', () => {
  const rows = [1000, 10000, 100000].map((baud, i) => ({ baud, marginUi: 0.4 - i * 0.3 }))
  const g = rateSweepGeometry(frame, rows, 0.1, 20000, 38400)
  it('marks the maximum and the link rate between the axis ends, and shades the broken part', () => {
    expect(g.maxX).toBeGreaterThan(g.area.x0)
    expect(g.currentX!).toBeGreaterThan(g.maxX!)
    expect(g.brokenPath).toMatch(/Z$/)
    expect(g.requiredY).toBeLessThan(g.zeroY)
  })
  it('leaves the maximum unmarked when there is none', () => {
    expect(rateSweepGeometry(frame, rows, 0.1, null, 38400).maxX).toBeNull()
  })
})

describe('pullupSweepGeometry', () => {
  it('stacks the margin panel under the time panel and marks the recommended row', () => {
    const rows = [1000, 2200, 4700].map((rl, i) => ({ rl, tplh: 5e-6 * (i + 1), tr: 3e-6 * (i + 1), ledCurrent: 0.02 / (i + 1), marginUi: 0.2 - 0.2 * i }))
    const g = pullupSweepGeometry({ ...frame, height: 330 }, 90, rows, 0.1, 1)
    expect(g.marginArea.y1).toBeGreaterThan(g.area.y0)
    expect(g.recommendedX).toBeCloseTo(g.rowX[1]!, 6)
    expect(g.tplh.path).toBeTruthy()
    expect(g.ledCurrent.path).toBeTruthy()
    expect(g.currentTicks.at(-1)!.label).toMatch(/mA/)
  })
})

describe('histogramGeometry', () => {
  it('draws one bar per bin and flags the failing ones', () => {
    const g = histogramGeometry(frame, [{ lo: -0.1, hi: 0, count: 2 }, { lo: 0, hi: 0.1, count: 5 }, { lo: 0.1, hi: 0.2, count: 1 }], 0.1)
    expect(g.bars.map((b) => b.failing)).toEqual([true, false, false])
    expect(g.bars[1]!.height).toBeGreaterThan(g.bars[0]!.height)
    expect(g.zeroX).toBeCloseTo(g.bars[1]!.x, 6)
  })
})

describe('spiTimelineGeometry', () => {
  const ch = { rise: { min: 8e-9, typ: 11e-9, max: 15e-9 }, fall: { min: 8e-9, typ: 10e-9, max: 15e-9 }, tr: { typ: 2e-9 }, tf: { typ: 2e-9 }, riseShape: 'ramp' as const, fallShape: 'ramp' as const, polarity: 'kept' as const }
  it('delays each edge by its direction and keeps the corner band', () => {
    const out = throughChannel([{ t: 0, rising: true }, { t: 10e-9, rising: false }], ch)
    expect(out.edges[0]!.t).toBeCloseTo(11e-9, 15)
    expect(out.edges[1]!.t).toBeCloseTo(20e-9, 15)
    expect(out.edges[0]!.band).toEqual({ min: 8e-9, max: 15e-9 })
  })
  it('lays out six lanes and one box per check with its state', () => {
    const g = spiTimelineGeometry({
      halfPeriod: 62.5e-9, cpol: 0, cpha: 1, sclk: ch, mosi: ch, miso: ch, clockToOut: { min: 2e-9, max: 12e-9 },
      checks: [{ id: 'miso-setup', slack: -1e-9, required: 5e-9 }, { id: 'mosi-hold', slack: 20e-9, required: 5e-9 }], width: 800,
    })
    expect(g.lanes.map((l) => l.name)).toEqual(['SCLK controller', 'SCLK peripheral', 'MOSI controller', 'MOSI peripheral', 'MISO peripheral', 'MISO controller'])
    expect(g.checks.map((c) => c.state)).toEqual(['broken', 'healthy'])
    expect(g.samples).toHaveLength(4)
  })
})
