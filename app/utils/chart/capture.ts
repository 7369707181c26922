/**
 * Geometry of a capture plot: each channel's min/max envelope (the display waveform,
 * downsampled on the server), its state levels and the 50 % instants of its edges.
 * d3 does the maths; Vue draws the SVG.
 */
import { scaleLinear } from 'd3-scale'
import { area as d3area } from 'd3-shape'
import type { CaptureResult, CaptureWaveform } from '../../../shared/types/capture'
import { extent, linearTicks, type Tick } from './axis'
import { plotArea, type PlotArea, type PlotFrame } from './plot'

export interface CaptureTrace {
  name: string
  /** SVG path of the min/max envelope */
  band: string
  /** pixel y of the low and high state levels, null when unknown */
  lowY: number | null
  highY: number | null
  /** pixel positions of the 50 % instants shown (at most `maxMarks` per channel) */
  marks: { x: number; y: number; polarity: 'rising' | 'falling' }[]
}

export interface CaptureGeometry {
  area: PlotArea
  xTicks: Tick[]
  yTicks: Tick[]
  traces: CaptureTrace[]
}

export function captureGeometry(f: PlotFrame, wave: CaptureWaveform, result: CaptureResult | null, maxMarks = 300): CaptureGeometry {
  const a = plotArea(f)
  const t = wave.t
  const tEnd = result ? result.timeEnd : (t[t.length - 1] ?? 1)
  const x = scaleLinear().domain([t[0] ?? 0, tEnd]).range([a.x0, a.x1])
  const all = wave.channels.flatMap((c) => [...c.min, ...c.max])
  const yDomain = extent(all, 0.08)
  const y = scaleLinear().domain(yDomain).range([a.y0, a.y1])
  const traces = wave.channels.map((c, ci) => {
    const pts = t.map((ti, i) => ({ x: x(ti), lo: y(c.min[i]!), hi: y(c.max[i]!) }))
    const band = d3area<{ x: number; lo: number; hi: number }>().x((p) => p.x).y0((p) => p.lo).y1((p) => p.hi)(pts) ?? ''
    const ch = result?.channels[ci]
    const levels = ch?.levels ?? null
    const marks = (ch?.edges ?? []).slice(0, maxMarks).map((e) => ({ x: x(e.t50), y: levels ? y(levels.ref50) : a.y1, polarity: e.polarity }))
    return { name: c.name, band, lowY: levels ? y(levels.low) : null, highY: levels ? y(levels.high) : null, marks }
  })
  return {
    area: a,
    xTicks: linearTicks([t[0] ?? 0, tEnd], [a.x0, a.x1], 6, 's'),
    yTicks: linearTicks(yDomain, [a.y0, a.y1], 5, 'V'),
    traces,
  }
}
