/**
 * Spread study (timing-model.md section 7): Monte Carlo over the link's ranges.
 *
 * Each trial draws, independently: every stage's tPLH and tPHL within its corners
 * (uniform between min and max, or normal around typ with sigma = (max - min)/6
 * truncated to the corners; PWD max, where stated, clamps one part's tPLH - tPHL), each
 * transition time between its typ and max, the receiver's switching thresholds within
 * their ranges, both clocks uniformly within their error intervals, the detection
 * latency uniformly within one tick, and every edge's jitter (Gaussian with the chain's
 * rms, plus uniform within +- its peak). The trial's result is the frame's worst margin
 * in UI over every bit and every data value (and both directions of a two-channel UART
 * link). The generator is seeded, so a study reproduces exactly. An RS-485 link is studied as
 * its UART data direction; its turnaround stays a worst-case check of the analysis.
 *
 * The kernel reduces each chain to a small plan of numbers once, then evaluates only
 * sums in the trial loop.
 */
import type { Link, LinkSpec, LinkInput } from '../../shared/schemas/link'
import { analyzeParsedLink, parseLink } from './analyze'
import { analyzeChain } from './chain'
import { offsetFactor, thresholdFraction, type Direction } from './edges'
import { EngineInputError } from './errors'
import { createRng, histogram, quantileSorted, type HistogramBin, type Rng } from './statistics'
import type { EdgeShape } from './types'
import { frameLayout, type UartChannelResult } from './uart'
import { ENGINE_VERSION } from './version'
import type { SpreadStudyOptions, SpreadStudyResult } from '../../shared/types/analysis'
export type { SpreadStudyOptions, SpreadStudyResult }



/** One output direction of one stage in the plan. */
interface DirPlan {
  pass: boolean
  /** which input direction feeds it */
  fromUp: boolean
  /** offset = input transition * g (the stage's input threshold on the input edge's shape) */
  g: number
}

interface StagePlan {
  tplh: [number, number, number]
  tphl: [number, number, number]
  pwdMax: number
  tr: [number, number]
  tf: [number, number]
  up: DirPlan
  down: DirPlan
}

interface EdgeInfo {
  shape: EdgeShape
  vLow: number
  vHigh: number
}

interface ChainPlan {
  stages: StagePlan[]
  /** receiver: thresholds and the shapes / swings of the edges arriving at the pin */
  schmitt: boolean
  thrUp: [number, number]
  thrDown: [number, number]
  upEdge: EdgeInfo
  downEdge: EdgeInfo
  jitterRms: number
  jitterPeak: number
}

interface DirectionPlan {
  chain: ChainPlan
  invert: boolean
  oversampling: number
  latency: number
  txErr: [number, number]
  rxErr: [number, number]
  early: { ce: Float64Array; pos: Float64Array; rising: Uint8Array; edge: Int32Array }
  late: { cl: Float64Array; pos: Float64Array; rising: Uint8Array; edge: Int32Array }
  edges: number
}

function buildChainPlan(link: Link, ci: number): ChainPlan {
  const ch = link.channels[ci]!
  const analysis = analyzeChain(ch)
  const stages: StagePlan[] = []
  // shapes of the current up/down edges (which stage launched them)
  let up: EdgeInfo = { shape: 'ramp', vLow: 0, vHigh: ch.receiver.vdd }
  let down: EdgeInfo = { ...up }
  analysis.stages.forEach((s, i) => {
    const m = s.model
    const spec = ch.stages[i]!
    const xr = spec.inputThreshold?.rise ?? 0.5
    const xf = spec.inputThreshold?.fall ?? 0.5
    const dir = (o: Direction): DirPlan => {
      const inDir: Direction = m.inverting ? (o === 'rise' ? 'fall' : 'rise') : o
      const pass = !m.inverting && !!m.passThrough?.[o]
      const input = inDir === 'rise' ? up : down
      return { pass, fromUp: inDir === 'rise', g: pass ? 0 : offsetFactor(inDir, input.shape, inDir === 'rise' ? xr : xf) }
    }
    const plan: StagePlan = {
      tplh: [m.tplh.min, m.tplh.typ, m.tplh.max],
      tphl: [m.tphl.min, m.tphl.typ, m.tphl.max],
      pwdMax: m.pwdMax ?? Infinity,
      tr: [m.tr.typ, m.tr.max],
      tf: [m.tf.typ, m.tf.max],
      up: dir('rise'),
      down: dir('fall'),
    }
    stages.push(plan)
    const newUp = plan.up.pass ? up : { shape: m.riseShape, vLow: m.vLow, vHigh: m.vHigh }
    const newDown = plan.down.pass ? down : { shape: m.fallShape, vLow: m.vLow, vHigh: m.vHigh }
    up = newUp
    down = newDown
  })
  const rx = ch.receiver
  const range = (t: number | { min: number; max: number } | undefined, dflt: number): [number, number] =>
    t === undefined ? [dflt, dflt] : typeof t === 'number' ? [t, t] : [t.min, t.max]
  const schmitt = !!(rx.schmitt && rx.vtPlus !== undefined && rx.vtMinus !== undefined)
  return {
    stages,
    schmitt,
    thrUp: schmitt ? range(rx.vtPlus, rx.vih) : [rx.vil, rx.vih],
    thrDown: schmitt ? range(rx.vtMinus, rx.vil) : [rx.vil, rx.vih],
    upEdge: up,
    downEdge: down,
    jitterRms: analysis.jitterRms,
    jitterPeak: analysis.jitterPeak,
  }
}

/** Draw within corners: uniform min..max, or normal around typ with sigma (max-min)/6, truncated. */
function draw(rng: Rng, c: [number, number, number], normal: boolean): number {
  if (c[2] <= c[0]) return c[1]
  if (!normal) return c[0] + (c[2] - c[0]) * rng.next()
  const v = c[1] + ((c[2] - c[0]) / 6) * rng.normal()
  return v < c[0] ? c[0] : v > c[2] ? c[2] : v
}

const xOf = (v: number, e: EdgeInfo) => {
  const x = thresholdFraction(v, e.vLow, e.vHigh)
  return x <= 0.01 ? 0.01 : x >= 0.99 ? 0.99 : x
}

/** One trial's D_rise - D_fall at the receiving pin (physical), seconds. */
function samplePwd(p: ChainPlan, rng: Rng, normal: boolean): number {
  let dUp = 0
  let dDown = 0
  let tUp = 0 // transition of the current up edge
  let tDown = 0
  for (const s of p.stages) {
    const tplh = draw(rng, s.tplh, normal)
    let tphl = draw(rng, s.tphl, normal)
    if (tplh - tphl > s.pwdMax) tphl = tplh - s.pwdMax
    else if (tphl - tplh > s.pwdMax) tphl = tplh + s.pwdMax
    const tr = s.tr[0] + (s.tr[1] - s.tr[0]) * rng.next()
    const tf = s.tf[0] + (s.tf[1] - s.tf[0]) * rng.next()
    const inU = s.up.fromUp ? dUp : dDown
    const inUt = s.up.fromUp ? tUp : tDown
    const inD = s.down.fromUp ? dUp : dDown
    const inDt = s.down.fromUp ? tUp : tDown
    const nUp = s.up.pass ? inU + tplh : inU + inUt * s.up.g + tplh
    const nUpT = s.up.pass ? inUt : tr
    const nDown = s.down.pass ? inD + tphl : inD + inDt * s.down.g + tphl
    const nDownT = s.down.pass ? inDt : tf
    dUp = nUp
    tUp = nUpT
    dDown = nDown
    tDown = nDownT
  }
  // receiver thresholds: a plain CMOS input has one threshold for both edges
  const vUp = p.thrUp[0] + (p.thrUp[1] - p.thrUp[0]) * rng.next()
  const vDown = p.schmitt ? p.thrDown[0] + (p.thrDown[1] - p.thrDown[0]) * rng.next() : vUp
  const offUp = tUp === 0 ? 0 : tUp * offsetFactor('rise', p.upEdge.shape, xOf(vUp, p.upEdge))
  const offDown = tDown === 0 ? 0 : tDown * offsetFactor('fall', p.downEdge.shape, xOf(vDown, p.downEdge))
  return dUp + offUp - (dDown + offDown)
}

function buildDirection(link: Link, ci: number, r: UartChannelResult): DirectionPlan {
  const u = link.uart!
  const layout = frameLayout(u.dataBits, u.parity, u.stopBits, u.backToBack)
  const s = r.sampler
  const early = { ce: [] as number[], pos: [] as number[], rising: [] as number[], edge: [] as number[] }
  const late = { cl: [] as number[], pos: [] as number[], rising: [] as number[], edge: [] as number[] }
  // jitter slots: 0 = sync edge, j = boundary j (1..K), K+1 = next start edge
  const K = layout.labels.length - 1
  // Within one trial a run start at `pos` is most critical for the first bit of its run
  // (bit pos) and a run end for the last bit (pos - 1): the sample position grows with the
  // bit index. A boundary seen with both directions is worst with the rising edge when
  // D_rise - D_fall > 0, else with the falling one; so one entry per boundary and side.
  const starts = new Map<number, { k: number; rise: boolean; fall: boolean }>()
  const ends = new Map<number, { k: number; rise: boolean; fall: boolean }>()
  for (let k = 0; k <= K; k++) {
    for (const c of layout.early[k]!) {
      const e = starts.get(c.pos) ?? { k, rise: false, fall: false }
      if (c.rising) e.rise = true
      else e.fall = true
      starts.set(c.pos, e)
    }
    for (const c of layout.late[k]!) {
      const e = ends.get(c.pos) ?? { k, rise: false, fall: false }
      e.k = Math.max(e.k, k)
      if (c.rising) e.rise = true
      else e.fall = true
      ends.set(c.pos, e)
    }
  }
  // rising: 0 falling only, 1 rising only, 2 both (the worse of the two)
  const dirCode = (e: { rise: boolean; fall: boolean }) => (e.rise && e.fall ? 2 : e.rise ? 1 : 0)
  for (const [pos, e] of starts) {
    early.ce.push(e.k + s.early)
    early.pos.push(pos)
    early.rising.push(dirCode(e))
    early.edge.push(pos)
  }
  for (const [pos, e] of ends) {
    late.cl.push(e.k + s.late)
    late.pos.push(pos)
    late.rising.push(dirCode(e))
    late.edge.push(pos > K ? K + 1 : pos)
  }
  return {
    chain: buildChainPlan(link, ci),
    invert: link.channels[ci]!.receiver.invert ?? false,
    oversampling: s.oversampling ?? 0,
    latency: s.latency,
    txErr: [r.clocks.tx.min, r.clocks.tx.max],
    rxErr: [r.clocks.rx.min, r.clocks.rx.max],
    early: { ce: Float64Array.from(early.ce), pos: Float64Array.from(early.pos), rising: Uint8Array.from(early.rising), edge: Int32Array.from(early.edge) },
    late: { cl: Float64Array.from(late.cl), pos: Float64Array.from(late.pos), rising: Uint8Array.from(late.rising), edge: Int32Array.from(late.edge) },
    edges: K + 2,
  }
}

/** The study's options with their defaults, each checked (an EngineInputError names the option). */
function spreadOptions(options: SpreadStudyOptions) {
  const trials = options.trials ?? 10000
  const seed = options.seed ?? 1
  const bins = options.bins ?? 40
  if (!Number.isInteger(trials) || trials < 1 || trials > 1e6) throw new EngineInputError(['trials'], 'trials must be an integer from 1 to 1 000 000')
  if (!Number.isFinite(seed)) throw new EngineInputError(['seed'], 'seed must be a finite number')
  if (!Number.isInteger(bins) || bins < 1 || bins > 1000) throw new EngineInputError(['bins'], 'bins must be an integer from 1 to 1000')
  return { trials, seed, bins, normal: (options.distribution ?? 'uniform') === 'normal' }
}

/**
 * One trial of one direction: a PWD, both clock errors, a detection latency and every
 * edge's jitter drawn; the frame's worst margin over every early and late case, seconds.
 * `J` is scratch space for the edges' jitter.
 */
function trialWorstMargin(d: DirectionPlan, T: number, rng: ReturnType<typeof createRng>, normal: boolean, J: Float64Array): number {
  const pPhys = samplePwd(d.chain, rng, normal)
  const P = d.invert ? -pPhys : pPhys
  const eTx = d.txErr[0] + (d.txErr[1] - d.txErr[0]) * rng.next()
  const eRx = d.rxErr[0] + (d.rxErr[1] - d.rxErr[0]) * rng.next()
  const Ttx = T / (1 + eTx)
  const Trx = T / (1 + eRx)
  const L = d.latency * Trx * rng.next()
  const sig = d.chain.jitterRms
  const pk = d.chain.jitterPeak
  if (sig > 0 || pk > 0) for (let j = 0; j < d.edges; j++) J[j] = sig * rng.normal() + pk * (2 * rng.next() - 1)
  else J.fill(0)
  const j0 = J[0]!
  // rising code 2 (both directions seen): the start is latest, the end earliest, with max(P, 0) / min(P, 0)
  const pLate = P > 0 ? P : 0
  const pEarly = P < 0 ? P : 0
  let worst = Infinity
  const e = d.early
  for (let i = 0; i < e.ce.length; i++) {
    const edge = e.edge[i]!
    const code = e.rising[i]!
    const start = edge === 0 ? 0 : e.pos[i]! * Ttx + (code === 0 ? 0 : code === 1 ? P : pLate) + J[edge]! - j0
    const m = e.ce[i]! * Trx + L - start
    if (m < worst) worst = m
  }
  const l = d.late
  for (let i = 0; i < l.cl.length; i++) {
    const code = l.rising[i]!
    const end = l.pos[i]! * Ttx + (code === 0 ? 0 : code === 1 ? P : pEarly) + J[l.edge[i]!]! - j0
    const m = end - (l.cl[i]! * Trx + L)
    if (m < worst) worst = m
  }
  return worst
}

/** The distribution of the trials' worst margins (UI): failures, below-required count, quantiles, mean. */
function summariseTrials(results: Float64Array, req: number) {
  const trials = results.length
  let failures = 0
  let below = 0
  let sum = 0
  for (let t = 0; t < trials; t++) {
    const v = results[t]!
    if (v < 0) failures++
    if (v < req) below++
    sum += v
  }
  const sorted = results.slice().sort()
  const q = (p: number) => quantileSorted(sorted, p)
  return {
    failures,
    below,
    sorted,
    worstMarginUi: { min: sorted[0]!, p1: q(0.01), p5: q(0.05), p25: q(0.25), p50: q(0.5), p75: q(0.75), p95: q(0.95), p99: q(0.99), max: sorted[trials - 1]!, mean: sum / trials },
  }
}

/**
 * Monte Carlo spread study of a UART link: the distribution of the frame's worst margin.
 * @returns trials, failures (worst margin below 0 UI), failFraction, quantiles and a histogram
 */
export function spreadStudy(input: LinkInput | Link, options: SpreadStudyOptions = {}): SpreadStudyResult {
  const link = parseLink(input)
  const { trials, seed, bins, normal } = spreadOptions(options)
  if ((link.protocol !== 'uart' && link.protocol !== 'rs485') || !link.uart)
    throw new EngineInputError(['protocol'], 'the spread study covers UART and RS-485 links (clocks, detection latency and per-bit margins); SPI, I2C and CAN links are judged by their worst-case slacks')

  const analysis = analyzeParsedLink(link)
  const uartIdx = link.channels.map((c, i) => (c.role === 'uart' ? i : -1)).filter((i) => i >= 0)
  const dirs = uartIdx.map((ci, n) => buildDirection(link, ci, analysis.uart!.byChannel[n]!))
  const T = 1 / link.uart.baud
  const rng = createRng(seed)
  const results = new Float64Array(trials)
  const J = new Float64Array(Math.max(...dirs.map((d) => d.edges)))
  const t0 = performance.now()
  for (let t = 0; t < trials; t++) {
    let worst = Infinity
    for (const d of dirs) worst = Math.min(worst, trialWorstMargin(d, T, rng, normal, J))
    results[t] = worst / T
  }
  const elapsedMs = performance.now() - t0

  const req = link.uart.requiredMarginUi
  const sum = summariseTrials(results, req)
  return {
    engineVersion: ENGINE_VERSION,
    trials,
    seed,
    distribution: normal ? 'normal' : 'uniform',
    failures: sum.failures,
    failFraction: sum.failures / trials,
    belowRequired: sum.below,
    belowRequiredFraction: sum.below / trials,
    requiredMarginUi: req,
    worstMarginUi: sum.worstMarginUi,
    histogram: histogram(sum.sorted, bins),
    channels: uartIdx.map((i) => link.channels[i]!.id),
    elapsedMs,
  }
}
