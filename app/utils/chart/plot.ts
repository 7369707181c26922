/**
 * Geometry of the line plots (rate sweep, pull-up sweep) and the spread histogram:
 * scales from d3-scale, paths from d3-shape, numbers and path strings out.
 */
import { scaleLinear, scaleLog } from 'd3-scale'
import { line } from 'd3-shape'
import { extent, linearTicks, logTicks, type Tick } from './axis'

export interface PlotFrame {
  width: number
  height: number
  margin: { top: number; right: number; bottom: number; left: number }
}

export interface PlotArea {
  x0: number
  x1: number
  y0: number
  y1: number
}

export function plotArea(f: PlotFrame): PlotArea {
  return { x0: f.margin.left, x1: f.width - f.margin.right, y0: f.height - f.margin.bottom, y1: f.margin.top }
}

export interface Series {
  /** SVG path "d"; empty when there are fewer than two finite points */
  path: string
  points: { x: number; y: number; px: number; py: number }[]
}

/** A path through (x, y) points; gaps (null / non-finite y) break the line. */
export function seriesPath(points: { x: number; y: number | null }[], sx: (v: number) => number, sy: (v: number) => number): Series {
  const ok = points.filter((p): p is { x: number; y: number } => p.y !== null && Number.isFinite(p.y) && Number.isFinite(p.x))
  const gen = line<{ x: number; y: number | null }>()
    .defined((p) => p.y !== null && Number.isFinite(p.y))
    .x((p) => sx(p.x))
    .y((p) => sy(p.y as number))
  return { path: ok.length >= 2 ? (gen(points) ?? '') : '', points: ok.map((p) => ({ ...p, px: sx(p.x), py: sy(p.y) })) }
}

export interface RateSweepGeometry {
  area: PlotArea
  xTicks: Tick[]
  yTicks: Tick[]
  margin: Series
  /** y pixel of the required margin line and of zero */
  requiredY: number
  zeroY: number
  /** x pixel of the maximum rate (null when none) and of the link's rate */
  maxX: number | null
  currentX: number | null
  /** filled area where the curve is below zero (broken) */
  brokenPath: string
  /** where the curve leaves the axis below its floor (−1 UI): from which rate, and its true lowest value */
  floor: { y: number; fromX: number; lowest: number; lowestBaud: number } | null
  /** the two rate labels, placed apart: each on the side of its line where it does not meet the other or the edge */
  labels: { max: { x: number; anchor: 'start' | 'end' } | null; current: { x: number; anchor: 'start' | 'end' } | null }
}

/** The lowest margin the rate-sweep axis shows; lower values are marked with their true extreme. */
export const SWEEP_FLOOR_UI = -1

/** Rate sweep: worst margin (UI) against baud on a log axis, with the required line and the maximum. */
export function rateSweepGeometry(
  f: PlotFrame,
  rows: { baud: number; marginUi: number }[],
  requiredUi: number,
  maxBaud: number | null,
  currentBaud: number | null,
): RateSweepGeometry {
  const area = plotArea(f)
  const bauds = rows.map((r) => r.baud).filter((b) => b > 0)
  const xd: [number, number] = bauds.length ? [Math.min(...bauds), Math.max(...bauds)] : [1e3, 1e6]
  if (xd[0] === xd[1]) xd[1] = xd[0] * 10
  const sx = scaleLog().domain(xd).range([area.x0, area.x1]).clamp(true)
  const yd = extent(rows.map((r) => r.marginUi), 0.08, [0, requiredUi])
  yd[0] = Math.max(yd[0], SWEEP_FLOOR_UI)
  yd[1] = Math.min(Math.max(yd[1], requiredUi + 0.05), 0.6)
  const sy = scaleLinear().domain(yd).range([area.y0, area.y1]).clamp(true)
  const margin = seriesPath(rows.map((r) => ({ x: r.baud, y: r.marginUi })), sx, sy)
  const zeroY = sy(0)
  // area between the curve and zero where the margin is negative
  const below = rows.map((r) => ({ x: r.baud, y: Math.min(r.marginUi, 0) }))
  const brokenPath = rows.some((r) => r.marginUi < 0)
    ? `${seriesPath(below, sx, sy).path}L${sx(below.at(-1)!.x)},${zeroY}L${sx(below[0]!.x)},${zeroY}Z`
    : ''
  const inX = (v: number | null) => (v !== null && v >= xd[0] && v <= xd[1] ? sx(v) : null)
  const lowest = rows.reduce<{ baud: number; marginUi: number } | null>((m, r) => (!m || r.marginUi < m.marginUi ? r : m), null)
  const first = rows.find((r) => r.marginUi < yd[0])
  const floor = lowest && first && lowest.marginUi < yd[0] ? { y: sy(yd[0]), fromX: sx(first.baud), lowest: lowest.marginUi, lowestBaud: lowest.baud } : null
  const maxX = inX(maxBaud)
  const currentX = inX(currentBaud)
  const LABEL = 96
  const side = (x: number, preferEnd: boolean) => {
    const end = (preferEnd && x - LABEL >= area.x0) || x + LABEL > area.x1
    return { x: end ? x - 4 : x + 4, anchor: end ? ('end' as const) : ('start' as const) }
  }
  // close lines: the lower rate's label to the left of its line, the higher rate's to the right
  const close = maxX !== null && currentX !== null && Math.abs(maxX - currentX) < LABEL
  const labels = {
    max: maxX === null ? null : side(maxX, close && maxX <= currentX!),
    current: currentX === null ? null : side(currentX, close && currentX < maxX!),
  }
  return {
    area,
    xTicks: logTicks(xd, [area.x0, area.x1], 6, 'Bd'),
    yTicks: linearTicks(yd, [area.y0, area.y1], 6, 'UI', 2).map((t) => ({ ...t, label: t.value.toFixed(2) })),
    margin,
    requiredY: sy(requiredUi),
    zeroY,
    maxX,
    currentX,
    brokenPath,
    floor,
    labels,
  }
}

export interface PullupSweepGeometry {
  area: PlotArea
  marginArea: PlotArea
  xTicks: Tick[]
  timeTicks: Tick[]
  currentTicks: Tick[]
  marginTicks: Tick[]
  tplh: Series
  tr: Series
  ledCurrent: Series
  margin: Series
  requiredY: number
  zeroY: number
  /** x pixel of the recommended row, null when none */
  recommendedX: number | null
  /** x pixel of each row, for markers of infeasible rows */
  rowX: number[]
  /** the characterised points on the time axes (tPLH and tr markers) */
  points: { px: number; tplhY: number | null; trY: number | null; rl: number }[]
}

/**
 * Pull-up sweep: tPLH and tr (left axis, seconds) and the LED current (right axis,
 * amperes) against RL on a log axis; below, the margin (UI) against the same RL axis.
 */
export function pullupSweepGeometry(
  f: PlotFrame,
  marginHeight: number,
  rows: { rl: number; tplh: number; tr: number; ledCurrent: number | null; marginUi: number | null }[],
  requiredUi: number,
  recommended: number | null,
  points: { rl: number; tplh?: number; tr?: number }[] = [],
): PullupSweepGeometry {
  const full = plotArea(f)
  const gap = 24
  const area: PlotArea = { ...full, y0: full.y0 - marginHeight - gap }
  const marginArea: PlotArea = { ...full, y1: full.y0 - marginHeight }
  const rls = rows.map((r) => r.rl)
  const xd: [number, number] = rls.length ? [Math.min(...rls), Math.max(...rls)] : [100, 10000]
  const inX = points.filter((p) => p.rl >= xd[0] && p.rl <= xd[1])
  if (xd[0] === xd[1]) xd[1] = xd[0] * 10
  const sx = scaleLog().domain(xd).range([area.x0, area.x1])
  const td: [number, number] = [0, extent([...rows.flatMap((r) => [r.tplh, r.tr]), ...inX.flatMap((p) => [p.tplh ?? 0, p.tr ?? 0])], 0.08)[1]]
  const st = scaleLinear().domain(td).range([area.y0, area.y1]).nice()
  const cd: [number, number] = [0, extent(rows.map((r) => r.ledCurrent), 0.08)[1]]
  const sc = scaleLinear().domain(cd).range([area.y0, area.y1]).nice()
  const md = extent(rows.map((r) => r.marginUi), 0.1, [0, requiredUi])
  md[0] = Math.max(md[0], -1)
  const sm = scaleLinear().domain(md).range([marginArea.y0, marginArea.y1])
  return {
    area,
    marginArea,
    xTicks: logTicks(xd, [area.x0, area.x1], 6, 'Ω'),
    timeTicks: linearTicks(st.domain() as [number, number], [area.y0, area.y1], 5, 's'),
    currentTicks: linearTicks(sc.domain() as [number, number], [area.y0, area.y1], 5, 'A'),
    marginTicks: linearTicks(md, [marginArea.y0, marginArea.y1], 3, 'UI', 2).map((t) => ({ ...t, label: t.value.toFixed(2) })),
    tplh: seriesPath(rows.map((r) => ({ x: r.rl, y: r.tplh })), sx, st),
    tr: seriesPath(rows.map((r) => ({ x: r.rl, y: r.tr })), sx, st),
    ledCurrent: seriesPath(rows.map((r) => ({ x: r.rl, y: r.ledCurrent })), sx, sc),
    margin: seriesPath(rows.map((r) => ({ x: r.rl, y: r.marginUi === null ? null : Math.max(r.marginUi, md[0]) })), sx, sm),
    requiredY: sm(requiredUi),
    zeroY: sm(0),
    recommendedX: recommended !== null && rows[recommended] ? sx(rows[recommended]!.rl) : null,
    rowX: rows.map((r) => sx(r.rl)),
    points: inX.map((p) => ({ rl: p.rl, px: sx(p.rl), tplhY: p.tplh !== undefined ? st(p.tplh) : null, trY: p.tr !== undefined ? st(p.tr) : null })),
  }
}

export interface HistogramBar {
  x: number
  y: number
  width: number
  height: number
  /** the bin lies (mostly) below zero: those trials fail */
  failing: boolean
  count: number
  from: number
  to: number
}

export interface HistogramGeometry {
  area: PlotArea
  bars: HistogramBar[]
  xTicks: Tick[]
  yTicks: Tick[]
  zeroX: number | null
  requiredX: number | null
}

/** Spread study histogram of the worst margin (UI): bars, the zero line and the required margin. */
export function histogramGeometry(f: PlotFrame, bins: { lo: number; hi: number; count: number }[], requiredUi: number | null, unit = 'UI'): HistogramGeometry {
  const area = plotArea(f)
  const lo = bins.length ? Math.min(bins[0]!.lo, 0) : -0.1
  const hi = bins.length ? Math.max(bins.at(-1)!.hi, requiredUi ?? 0) : 0.5
  const sx = scaleLinear().domain([lo, hi]).range([area.x0, area.x1])
  const maxCount = Math.max(1, ...bins.map((b) => b.count))
  const sy = scaleLinear().domain([0, maxCount]).range([area.y0, area.y1]).nice()
  const bars = bins.map((b) => {
    const x = sx(b.lo)
    const w = Math.max(1, sx(b.hi) - x - 1)
    const y = sy(b.count)
    return { x, y, width: w, height: area.y0 - y, failing: (b.lo + b.hi) / 2 < 0, count: b.count, from: b.lo, to: b.hi }
  })
  const inX = (v: number | null) => (v !== null && v >= lo && v <= hi ? sx(v) : null)
  return {
    area,
    bars,
    xTicks: linearTicks([lo, hi], [area.x0, area.x1], 6, unit, 2).map((t) => (unit === 'UI' ? { ...t, label: t.value.toFixed(2) } : t)),
    yTicks: linearTicks(sy.domain() as [number, number], [area.y0, area.y1], 4).map((t) => ({ ...t, label: String(t.value) })),
    zeroX: inX(0),
    requiredX: inX(requiredUi),
  }
}
