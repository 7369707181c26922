/**
 * Placement of the bit timeline (UART) on the page: the engine's timeline (frame cells and
 * levels, lanes with their delays, corner bands and edge shapes; UartChannelResult.timeline)
 * and its per-bit windows and samples become pixels. No timing rule lives here: the frame,
 * the parity, the delays through each stage and the receiver's inversion are the engine's.
 */
import { scaleLinear } from 'd3-scale'
import { line } from 'd3-shape'
import type { TimelineLane } from '#shared/types/analysis'
import { uartMarginState, type MarginState, type ReadingThresholds } from '#shared/report/vocabulary'
import { linearTicks, type Tick } from './axis'

const LN2 = Math.LN2
const LN9 = Math.log(9)

export type Shape = 'ramp' | 'exponential'

/** A lane as the chart draws it: its name and the engine's lane. */
export interface LaneInput {
  name: string
  inverted: boolean
  edges: Pick<TimelineLane['edges'], 'rise' | 'fall' | 'tr' | 'tf' | 'riseShape' | 'fallShape'> & {
    riseRange?: { min: number; max: number } | null
    fallRange?: { min: number; max: number } | null
  }
}

export interface TimelineBit {
  index: number
  label: string
  marginUi: number
  earlyMargin: number
  lateMargin: number | null
  /** the deciding samples relative to the start edge's arrival, seconds */
  samples: { earliest: number; latest: number }
  validFrom: number
  validTo: number | null
}

export interface UartTimelineInput {
  bitTime: number
  /** frame length in bit times, stop bits included */
  frameBits: number
  /** logical level of each bit cell from the start bit on (0 / 1) */
  levels: number[]
  /** frames run back to back: the next start bit follows the stop time */
  backToBack: boolean
  lanes: LaneInput[]
  /** arrival of the start edge at the receiver, seconds after it left the driving pin */
  sync: number
  bits: TimelineBit[]
  requiredUi: number
  /** the team's reading thresholds (guard band) */
  thresholds?: ReadingThresholds
  width: number
  /** show only this bit (index), with a little of its neighbours */
  zoomBit?: number | null
}

export interface LaneGeometry {
  name: string
  y: number
  path: string
  bands: { x: number; width: number }[]
}

export type BitState = MarginState

export interface WindowGeometry {
  index: number
  label: string
  state: BitState
  marginUi: number
  /** valid window */
  x0: number
  x1: number
  /** the window has no end within the frame (idle line) */
  open: boolean
  /** sampling uncertainty band */
  s0: number
  s1: number
  /** where the samples fall outside the window (broken), pixel ranges */
  overlaps: { x: number; width: number }[]
  /** centre of the bit at the receiver, for its label */
  cx: number
}

export interface UartTimelineGeometry {
  width: number
  height: number
  plot: { x0: number; x1: number }
  xTicks: Tick[]
  cells: { x0: number; x1: number; label: string; level: number }[]
  lanes: LaneGeometry[]
  windowRow: number
  windows: WindowGeometry[]
  domain: [number, number]
}

export const TIMELINE_LAYOUT = { left: 132, right: 16, top: 26, laneHeight: 34, laneGap: 16, windowHeight: 64, axis: 28 }

/** The logical levels of the frame's cells for one data value, from the engine's level mask (bit j: cell j). */
export function levelsOf(mask: number, cells: number): number[] {
  return Array.from({ length: cells }, (_, j) => Math.floor(mask / 2 ** j) % 2)
}

/** Points (t, v) of one edge centred (50 %) at c, rising or falling, v in 0..1, until `until`. */
export function edgePoints(c: number, rising: boolean, transition: number, shape: Shape, until: number): [number, number][] {
  if (transition <= 0) return [[c, rising ? 0 : 1], [c, rising ? 1 : 0]]
  if (shape === 'ramp') {
    const half = (0.5 * transition) / 0.8
    const t0 = c - half
    const t1 = Math.min(c + half, until)
    const v1 = Math.min(1, (t1 - t0) / (2 * half))
    return [[t0, rising ? 0 : 1], [t1, rising ? v1 : 1 - v1]]
  }
  const tau = transition / LN9
  const t0 = c - tau * LN2
  const pts: [number, number][] = []
  const end = Math.min(t0 + 5 * tau, until)
  const n = 16
  for (let i = 0; i <= n; i++) {
    const t = t0 + ((end - t0) * i) / n
    const e = Math.exp(-(t - t0) / tau)
    pts.push([t, rising ? 1 - e : e])
  }
  return pts
}

/** Waveform points of a lane: levels per cell, edges moved by the lane's delays. */
export function lanePoints(levels: number[], bitTime: number, lane: LaneInput, t0: number, t1: number): [number, number][] {
  const phys = (l: number) => (lane.inverted ? 1 - l : l)
  const idle = phys(1)
  const edges: { c: number; rising: boolean }[] = []
  let prev = 1
  levels.forEach((l, j) => {
    if (l !== prev) {
      const rising = phys(l) === 1
      edges.push({ c: j * bitTime + (rising ? lane.edges.rise : lane.edges.fall), rising })
    }
    prev = l
  })
  const pts: [number, number][] = [[t0, idle]]
  edges.forEach((e, i) => {
    const next = edges[i + 1]
    const until = next ? next.c - 0.5 * (next.rising ? lane.edges.tr : lane.edges.tf) : t1
    const p = edgePoints(e.c, e.rising, e.rising ? lane.edges.tr : lane.edges.tf, e.rising ? lane.edges.riseShape : lane.edges.fallShape, Math.max(until, e.c))
    const last = pts[pts.length - 1]!
    // keep x increasing: an edge that starts before the previous one finished starts where we are
    for (const q of p) if (q[0] >= last[0]) pts.push(q)
  })
  const last = pts[pts.length - 1]!
  pts.push([t1, last[1] > 0.5 ? 1 : 0])
  return pts
}

/** Bands of a lane: the corner range of every edge's arrival. */
function laneBands(levels: number[], bitTime: number, lane: LaneInput): { t0: number; t1: number }[] {
  const out: { t0: number; t1: number }[] = []
  let prev = 1
  levels.forEach((l, j) => {
    if (l !== prev) {
      const rising = (lane.inverted ? 1 - l : l) === 1
      const r = rising ? lane.edges.riseRange : lane.edges.fallRange
      if (r && r.max > r.min) out.push({ t0: j * bitTime + r.min, t1: j * bitTime + r.max })
    }
    prev = l
  })
  return out
}

/**
 * The part of a waveform within [t0, t1]: the level at each end interpolated (a lane holds
 * its level between edges), so a zoomed view shows levels and steps, never a straight line
 * drawn between points outside the window.
 */
export function clipPoints(pts: [number, number][], t0: number, t1: number): [number, number][] {
  const at = (t: number): number => {
    if (t <= pts[0]![0]) return pts[0]![1]
    for (let i = 1; i < pts.length; i++) {
      const [xa, ya] = pts[i - 1]!
      const [xb, yb] = pts[i]!
      if (t <= xb) return xb === xa ? yb : ya + ((yb - ya) * (t - xa)) / (xb - xa)
    }
    return pts[pts.length - 1]![1]
  }
  return [[t0, at(t0)], ...pts.filter((p) => p[0] > t0 && p[0] < t1), [t1, at(t1)]]
}

export function uartTimelineGeometry(input: UartTimelineInput): UartTimelineGeometry {
  const L = TIMELINE_LAYOUT
  const T = input.bitTime
  const maxDelay = Math.max(0, ...input.lanes.flatMap((l) => [l.edges.rise, l.edges.fall, l.edges.riseRange?.max ?? 0, l.edges.fallRange?.max ?? 0]))
  const levels = input.backToBack ? [...input.levels, 0] : [...input.levels, 1]
  const frame: [number, number] = [-0.4 * T, input.frameBits * T + maxDelay + 0.4 * T]
  let domain: [number, number] = frame
  if (input.zoomBit !== null && input.zoomBit !== undefined) {
    const k = input.zoomBit
    domain = [input.sync + (k - 0.7) * T, input.sync + (k + 1.7) * T]
  }
  // the waveform is built over the whole frame (every edge, in order) and then clipped to the view
  const whole: [number, number] = [Math.min(frame[0], domain[0]), Math.max(frame[1], domain[1])]
  const x0 = L.left
  const x1 = input.width - L.right
  const sx = scaleLinear().domain(domain).range([x0, x1])
  const clampX = (x: number) => Math.max(x0, Math.min(x1, x))

  const cells = input.levels.map((level, j) => ({
    x0: clampX(sx(j * T)),
    x1: clampX(sx(Math.min(j + 1, input.frameBits) * T)),
    label: '',
    level,
  }))

  const lanes: LaneGeometry[] = input.lanes.map((lane, i) => {
    const y = L.top + i * (L.laneHeight + L.laneGap)
    const pts = clipPoints(lanePoints(levels, T, lane, whole[0], whole[1]), domain[0], domain[1]).map(
      (p) => [clampX(sx(p[0])), y + L.laneHeight - p[1] * L.laneHeight] as [number, number],
    )
    const bands = laneBands(levels, T, lane)
      .map((b) => ({ x: clampX(sx(b.t0)), width: clampX(sx(b.t1)) - clampX(sx(b.t0)) }))
      .filter((b) => b.width > 0)
    return { name: lane.name, y, path: line<[number, number]>()(pts) ?? '', bands }
  })

  const windowRow = L.top + input.lanes.length * (L.laneHeight + L.laneGap)
  const windows: WindowGeometry[] = input.bits.map((b) => {
    const s = input.sync
    const wx0 = clampX(sx(s + b.validFrom))
    const open = b.validTo === null
    const wx1 = open ? x1 : clampX(sx(s + b.validTo!))
    const s0 = clampX(sx(s + b.samples.earliest))
    const s1 = clampX(sx(s + b.samples.latest))
    const overlaps: { x: number; width: number }[] = []
    if (b.earlyMargin < 0) overlaps.push({ x: s0, width: Math.max(2, clampX(sx(s + b.validFrom)) - s0) })
    if (b.lateMargin !== null && b.lateMargin < 0) {
      const a = clampX(sx(s + b.validTo!))
      overlaps.push({ x: a, width: Math.max(2, s1 - a) })
    }
    return {
      index: b.index,
      label: b.label,
      state: uartMarginState(b.marginUi, input.requiredUi, input.thresholds),
      marginUi: b.marginUi,
      x0: Math.min(wx0, wx1),
      x1: Math.max(wx0, wx1),
      open,
      s0,
      s1,
      overlaps,
      cx: sx(s + (b.index + 0.5) * T),
    }
  })

  const height = windowRow + L.windowHeight + L.axis
  const ticks = linearTicks(domain, [x0, x1], Math.max(3, Math.floor((x1 - x0) / 90)), 's')
  return { width: input.width, height, plot: { x0, x1 }, xTicks: ticks, cells, lanes, windowRow, windows, domain }
}
