/**
 * Geometry of the SPI timeline: SCLK, MOSI and MISO at the controller and at the
 * peripheral over two clock periods (timing-model.md section 3), edges placed with the
 * channels' typical delays and their corner ranges as bands, plus one labelled box per
 * check with its slack. All times come from the server's analysis and the link's inputs.
 */
import { scaleLinear } from 'd3-scale'
import { line } from 'd3-shape'
import { linearTicks, type Tick } from './axis'
import { marginState } from '#shared/report/vocabulary'
import { edgePoints, type BitState, type Shape } from './timeline'

interface ChannelTiming {
  rise: { min: number; typ: number; max: number }
  fall: { min: number; typ: number; max: number }
  tr: { typ: number }
  tf: { typ: number }
  riseShape: Shape
  fallShape: Shape
  polarity: 'kept' | 'inverted'
}

export interface SpiTimelineInput {
  halfPeriod: number
  cpol: 0 | 1
  cpha: 0 | 1
  sclk: ChannelTiming
  mosi: ChannelTiming
  miso: ChannelTiming
  clockToOut: { min: number; max: number }
  checks: { id: string; slack: number; required: number }[]
  width: number
}

export interface SpiLane {
  name: string
  y: number
  path: string
  bands: { x: number; width: number }[]
}

export interface SpiTimelineGeometry {
  width: number
  height: number
  plot: { x0: number; x1: number }
  lanes: SpiLane[]
  samples: { name: string; x: number; y0: number; y1: number }[]
  checks: { id: string; slack: number; state: BitState }[]
  checkWidth: number
  checksY: number
  xTicks: Tick[]
}

interface Edge {
  t: number
  rising: boolean
  band?: { min: number; max: number }
}

const LANE = 26
const GAP = 14
const TOP = 10

/** Move ideal edges through a channel: each by its direction's delay (physical at the receiving pin). */
export function throughChannel(edges: Edge[], ch: ChannelTiming): { edges: Edge[]; inverted: boolean } {
  const inv = ch.polarity === 'inverted'
  return {
    inverted: inv,
    edges: edges.map((e) => {
      const rising = inv ? !e.rising : e.rising
      const d = rising ? ch.rise : ch.fall
      return { t: e.t + d.typ, rising, band: { min: e.t + d.min, max: e.t + d.max } }
    }),
  }
}

export function spiTimelineGeometry(input: SpiTimelineInput): SpiTimelineGeometry {
  const H = input.halfPeriod
  const x0 = 132
  const x1 = input.width - 16
  const maxDelay = Math.max(input.sclk.rise.max, input.sclk.fall.max) + input.clockToOut.max + Math.max(input.miso.rise.max, input.miso.fall.max)
  const domain: [number, number] = [0, 5 * H + maxDelay]
  const sx = scaleLinear().domain(domain).range([x0, x1])
  const clampX = (x: number) => Math.max(x0, Math.min(x1, x))

  // controller SCLK: leading edges at 0.5H and 2.5H, trailing at 1.5H and 3.5H
  const leadingRises = input.cpol === 0
  const sclkEdges: Edge[] = [0.5, 1.5, 2.5, 3.5].map((k, i) => ({ t: k * H, rising: i % 2 === 0 ? leadingRises : !leadingRises }))
  const launchIdx = input.cpha === 0 ? [1, 3] : [0, 2]
  const sampleIdx = input.cpha === 0 ? [0, 2] : [1, 3]
  const sclkP = throughChannel(sclkEdges, input.sclk)

  // data lines drawn as toggles at each launch edge (a change of bit)
  const toggles = (times: number[], band?: (t: number) => { min: number; max: number }): Edge[] =>
    times.map((t, i) => ({ t, rising: i % 2 === 0, ...(band ? { band: band(t) } : {}) }))
  const mosiC = toggles(launchIdx.map((i) => sclkEdges[i]!.t))
  const mosiP = throughChannel(mosiC, input.mosi)
  const ctoTyp = (input.clockToOut.min + input.clockToOut.max) / 2
  const misoPTimes = launchIdx.map((i) => sclkP.edges[i]!.t + ctoTyp)
  const misoP = toggles(misoPTimes, (t) => ({ min: t - ctoTyp + input.clockToOut.min, max: t - ctoTyp + input.clockToOut.max }))
  const misoC = throughChannel(misoP, input.miso)

  const lanesIn: { name: string; edges: Edge[]; initial: number; tr: number; tf: number; rs: Shape; fs: Shape }[] = [
    { name: 'SCLK controller', edges: sclkEdges, initial: input.cpol, tr: 0, tf: 0, rs: 'ramp', fs: 'ramp' },
    { name: 'SCLK peripheral', edges: sclkP.edges, initial: sclkP.inverted ? 1 - input.cpol : input.cpol, tr: input.sclk.tr.typ, tf: input.sclk.tf.typ, rs: input.sclk.riseShape, fs: input.sclk.fallShape },
    { name: 'MOSI controller', edges: mosiC, initial: 0, tr: 0, tf: 0, rs: 'ramp', fs: 'ramp' },
    { name: 'MOSI peripheral', edges: mosiP.edges, initial: mosiP.inverted ? 1 : 0, tr: input.mosi.tr.typ, tf: input.mosi.tf.typ, rs: input.mosi.riseShape, fs: input.mosi.fallShape },
    { name: 'MISO peripheral', edges: misoP, initial: 0, tr: 0, tf: 0, rs: 'ramp', fs: 'ramp' },
    { name: 'MISO controller', edges: misoC.edges, initial: misoC.inverted ? 1 : 0, tr: input.miso.tr.typ, tf: input.miso.tf.typ, rs: input.miso.riseShape, fs: input.miso.fallShape },
  ]
  const lanes: SpiLane[] = lanesIn.map((l, i) => {
    const y = TOP + i * (LANE + GAP)
    const pts: [number, number][] = [[domain[0], l.initial]]
    const sorted = [...l.edges].sort((a, b) => a.t - b.t)
    sorted.forEach((e, j) => {
      const next = sorted[j + 1]
      const tt = e.rising ? l.tr : l.tf
      const p = edgePoints(e.t, e.rising, tt, e.rising ? l.rs : l.fs, next ? next.t : domain[1])
      const last = pts[pts.length - 1]!
      for (const q of p) if (q[0] >= last[0]) pts.push(q)
    })
    pts.push([domain[1], pts[pts.length - 1]![1] > 0.5 ? 1 : 0])
    const path = line<[number, number]>()(pts.map((p) => [clampX(sx(p[0])), y + LANE - p[1] * LANE])) ?? ''
    const bands = l.edges.filter((e) => e.band && e.band.max > e.band.min).map((e) => ({ x: clampX(sx(e.band!.min)), width: clampX(sx(e.band!.max)) - clampX(sx(e.band!.min)) }))
    return { name: l.name, y, path, bands }
  })

  const laneY = (i: number) => TOP + i * (LANE + GAP)
  const samples = [
    ...sampleIdx.map((i) => ({ name: 'peripheral samples MOSI', x: sx(sclkP.edges[i]!.t), y0: laneY(1), y1: laneY(3) + LANE })),
    ...sampleIdx.map((i) => ({ name: 'controller samples MISO', x: sx(sclkEdges[i]!.t), y0: laneY(0), y1: laneY(5) + LANE })),
  ]
  const checksY = TOP + lanes.length * (LANE + GAP) + 4
  const checks = input.checks.map((c) => ({ id: c.id, slack: c.slack, state: marginState(c.slack, c.required) }))
  const checkWidth = (x1 - x0) / Math.max(1, checks.length)
  return {
    width: input.width,
    height: checksY + 30 + 30,
    plot: { x0, x1 },
    lanes,
    samples,
    checks,
    checkWidth,
    checksY,
    xTicks: linearTicks(domain, [x0, x1], 6, 's'),
  }
}
