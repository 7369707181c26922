/**
 * Chain propagation (timing-model.md section 1): a channel's rising and falling edges
 * carried stage by stage from the driving pin to the receiving pin.
 *
 * Each stage switches when its input edge crosses the stage's input threshold (50 % of
 * the previous swing unless the stage gives `inputThreshold`), then adds tPLH or tPHL
 * for the direction of its OUTPUT (JEDEC convention) and launches its own output edge
 * (transition time, shape, swing). The receiving pin switches at the receiver's
 * thresholds: a plain CMOS input anywhere between VIL and VIH (rising: min at the VIL
 * crossing, max at the VIH crossing, typ at 50 %; falling the other way round), a
 * Schmitt input at VT+ (rising) and VT- (falling).
 *
 * Chain PWD is D_rise - D_fall at the receiving pin: the sum over stages of each
 * stage's own asymmetry (its rising-output minus falling-output delay, threshold
 * offsets included, tightened by PWD max), with the sign flipped when an odd number of
 * inverting stages follows it. Worst case: the interval sum. Statistical: the spreads
 * added as root-sum-square, min/max taken as +-3 sigma.
 */
import type { ChannelSpec, ThresholdSpec } from '../../shared/schemas/link'
import { thresholdFraction, thresholdOffset, type Direction } from './edges'
import type { CouplerModelInfo, PhototransistorOperating } from './phototransistor'
import { formatEng } from '../../shared/utils/units'
import { DEFAULT_MAX_INPUT_TRANSITION } from '../../shared/utils/receiver-presets'
import { EngineInputError } from './errors'
import { reduceStage } from './stages'
import type { ChainResult, Corners, EdgeShape, StageEdgeModel, Warning } from './types'

/** An edge at some node of the chain. */
interface EdgeState {
  /** delay from the driving pin's 50 % crossing to this edge's 50 % point, seconds */
  delay: Corners
  /** 10-90 % (rising) or 90-10 % (falling) time, seconds */
  transition: { typ: number; max: number }
  shape: EdgeShape
  vLow: number
  vHigh: number
}

/** One stage's part in the chain result. */
export interface StageContribution {
  index: number
  name: string
  kind: string
  inverting: boolean
  model: StageEdgeModel
  /** (delay of its rising output) - (delay of its falling output), input threshold offsets included, seconds */
  asymmetry: Corners
  /** +1 or -1: the sign with which the asymmetry enters D_rise - D_fall at the receiving pin */
  sign: 1 | -1
  operating?: PhototransistorOperating
  coupler?: CouplerModelInfo
}

/** ChainResult plus what the report and the spread study need to see inside it. */
export interface ChainAnalysis extends ChainResult {
  /** nominal (typical) D_rise - D_fall, seconds */
  pwdTyp: number
  stages: StageContribution[]
  /** the receiving pin's own contribution to D_rise - D_fall (threshold offsets), seconds */
  receiverTerm: Corners
  /** false when a threshold lies outside the swing that should cross it (the link cannot work) */
  reachable: boolean
}

const add = (a: Corners, b: Corners): Corners => ({ min: a.min + b.min, typ: a.typ + b.typ, max: a.max + b.max })
const flipDir = (d: Direction): Direction => (d === 'rise' ? 'fall' : 'rise')

/** min/typ/max of an edge's threshold offset over its transition range [typ, max] and threshold fractions `xs`. */
function offsetCorners(direction: Direction, edge: EdgeState, xs: readonly number[], xTyp: number): Corners {
  let min = Infinity
  let max = -Infinity
  for (const x of xs)
    for (let k = 0; k < 2; k++) {
      const o = thresholdOffset(direction, edge.shape, k === 0 ? edge.transition.typ : edge.transition.max, x)
      if (o < min) min = o
      if (o > max) max = o
    }
  return { min, typ: thresholdOffset(direction, edge.shape, edge.transition.typ, xTyp), max }
}

/** Where a stage's input switches, as fractions of the driving swing: the range and the typical value. */
interface InputThreshold {
  xs: number[]
  typ: number
}

/**
 * A stage's output edge in direction `o` and the threshold offset of its own input: the
 * input edge (the other direction when the stage inverts) plus the offset at the stage's
 * input threshold plus tPLH or tPHL; a pass-through direction carries the input edge on.
 */
function stageOutput(model: StageEdgeModel, o: Direction, up: EdgeState, down: EdgeState, rise: InputThreshold, fall: InputThreshold): { edge: EdgeState; offset: Corners } {
  const delay = o === 'rise' ? model.tplh : model.tphl
  const pass = !model.inverting && model.passThrough?.[o]
  const inDir = model.inverting ? flipDir(o) : o
  const input = inDir === 'rise' ? up : down
  if (pass) return { edge: { ...input, delay: add(input.delay, delay) }, offset: { min: 0, typ: 0, max: 0 } }
  const th = inDir === 'rise' ? rise : fall
  const offset = offsetCorners(inDir, input, th.xs, th.typ)
  return {
    edge: {
      delay: add(add(input.delay, offset), delay),
      transition: o === 'rise' ? { ...model.tr } : { ...model.tf },
      shape: o === 'rise' ? model.riseShape : model.fallShape,
      vLow: model.vLow,
      vHigh: model.vHigh,
    },
    offset,
  }
}

/** x of a threshold in an edge's swing, clamped into (0, 1) without a warning (the range's checks warn). */
function fractionQuiet(v: number, edge: EdgeState): number {
  const span = edge.vHigh - edge.vLow
  const x = span > 0 ? thresholdFraction(v, edge.vLow, edge.vHigh) : 0.5
  return Math.min(0.99, Math.max(0.01, x))
}

/** A threshold as its [low, high] range and typical value, volts. */
function thresholdRange(t: ThresholdSpec): { lo: number; hi: number; typ: number } {
  return typeof t === 'number' ? { lo: t, hi: t, typ: t } : { lo: t.min, hi: t.max, typ: (t.min + t.max) / 2 }
}

/**
 * Threshold fractions read against the swing that must cross them: a threshold outside
 * its swing marks the channel unreachable (once, with a warning) and is clamped into it.
 */
class ThresholdReader {
  reachable = true
  constructor(
    private readonly channelId: string,
    private readonly warnings: Warning[],
  ) {}

  fraction(v: number, edge: EdgeState, field: string): number {
    const span = edge.vHigh - edge.vLow
    const x = span > 0 ? thresholdFraction(v, edge.vLow, edge.vHigh) : 0.5
    if (span > 0 && x > 0 && x < 1) return x
    if (this.reachable)
      this.warnings.push({
        code: 'threshold-unreachable',
        channel: this.channelId,
        message: `Channel '${this.channelId}': the ${field} threshold ${formatEng(v, 'V')} is outside the swing ${formatEng(edge.vLow, 'V')}..${formatEng(edge.vHigh, 'V')} that drives it, so the input never switches there. The link cannot work.`,
      })
    this.reachable = false
    return Math.min(0.99, Math.max(0.01, x))
  }

  /** A threshold range as fractions of an edge's swing: its ends and its typical value. */
  range(t: ThresholdSpec, edge: EdgeState, field: string): InputThreshold {
    const r = thresholdRange(t)
    return { xs: [this.fraction(r.lo, edge, field), this.fraction(r.hi, edge, field)], typ: this.fraction(r.typ, edge, field) }
  }
}

/** Where a stage's own input switches: a Schmitt input of a buffer at VT+ / VT-, else fractions of the previous swing (50 % unless stated). */
function stageInputThresholds(stage: ChannelSpec['stages'][number], up: EdgeState, down: EdgeState, th: ThresholdReader): { rise: InputThreshold; fall: InputThreshold } {
  if (stage.kind === 'digital' && stage.schmittInput) {
    const where = `stage '${stage.name}' input`
    return { rise: th.range(stage.schmittInput.vtPlus, up, `${where} VT+`), fall: th.range(stage.schmittInput.vtMinus, down, `${where} VT-`) }
  }
  const xRise = stage.inputThreshold?.rise ?? 0.5
  const xFall = stage.inputThreshold?.fall ?? 0.5
  return { rise: { xs: [xRise], typ: xRise }, fall: { xs: [xFall], typ: xFall } }
}

/** A stage's own tPLH - tPHL, tightened by its PWD max (the corners win, with a warning, when they contradict it). */
function stageAsymmetry(model: StageEdgeModel, name: string, warn: (message: string) => void): Corners {
  let lo = model.tplh.min - model.tphl.max
  let hi = model.tplh.max - model.tphl.min
  if (model.pwdMax !== undefined) {
    // a relative tolerance keeps entered values such as 40 ns / 32 ns / PWD max 8 ns consistent despite rounding
    const tol = 1e-9 * Math.max(model.pwdMax, Math.abs(lo), Math.abs(hi)) + 1e-21
    if (lo > model.pwdMax + tol || hi < -model.pwdMax - tol)
      warn(`Stage '${name}': PWD max ${model.pwdMax} s is below the smallest |tPLH - tPHL| its delay corners allow; the corners win (the asymmetry is taken as ${lo > 0 ? lo : hi} s). Check the entered values.`)
    if (lo > model.pwdMax) hi = lo
    else if (hi < -model.pwdMax) lo = hi
    else {
      lo = Math.max(lo, -model.pwdMax)
      hi = Math.min(hi, model.pwdMax)
    }
  }
  return { min: lo, typ: Math.min(hi, Math.max(lo, model.tplh.typ - model.tphl.typ)), max: hi }
}

/** Sign of each stage's asymmetry at the receiving pin (flipped by every inverting stage after it) and the chain's polarity. */
function assignSigns(stages: StageContribution[]): 'kept' | 'inverted' {
  let after = 0
  for (let i = stages.length - 1; i >= 0; i--) {
    stages[i]!.sign = after % 2 === 0 ? 1 : -1
    if (stages[i]!.inverting) after++
  }
  return after % 2 === 0 ? 'kept' : 'inverted'
}

/**
 * The receiving pin's threshold offsets: a Schmitt input at VT+ and VT- (independent
 * ranges), a plain CMOS input at one threshold in VIL..VIH shared by both edges of a part.
 */
function receiverOffsets(rx: ChannelSpec['receiver'], up: EdgeState, down: EdgeState, th: ThresholdReader): { rise: Corners; fall: Corners; term: Corners } {
  if (rx.schmitt && rx.vtPlus !== undefined && rx.vtMinus !== undefined) {
    const p = th.range(rx.vtPlus, up, 'VT+')
    const m = th.range(rx.vtMinus, down, 'VT-')
    const rise = offsetCorners('rise', up, p.xs, p.typ)
    const fall = offsetCorners('fall', down, m.xs, m.typ)
    return { rise, fall, term: { min: rise.min - fall.max, typ: rise.typ - fall.typ, max: rise.max - fall.min } }
  }
  const xUp = [th.fraction(rx.vil, up, 'VIL'), th.fraction(rx.vih, up, 'VIH')]
  const xDown = [th.fraction(rx.vil, down, 'VIL'), th.fraction(rx.vih, down, 'VIH')]
  // the typical switching point: half the receiver's supply, kept within VIL..VIH (a 5 V
  // swing into a 3.3 V input switches near 1.65 V, not at 2.5 V)
  const vTyp = Math.min(rx.vih, Math.max(rx.vil, rx.vdd / 2))
  const rise = offsetCorners('rise', up, xUp, fractionQuiet(vTyp, up))
  const fall = offsetCorners('fall', down, xDown, fractionQuiet(vTyp, down))
  // D_rise - D_fall is monotone in the one threshold: its extremes are at VIL and VIH with
  // each edge's transition time at its typ or max
  let min = Infinity
  let max = -Infinity
  for (let k = 0; k < 2; k++)
    for (const tr of [up.transition.typ, up.transition.max])
      for (const tf of [down.transition.typ, down.transition.max]) {
        const v = thresholdOffset('rise', up.shape, tr, xUp[k]!) - thresholdOffset('fall', down.shape, tf, xDown[k]!)
        if (v < min) min = v
        if (v > max) max = v
      }
  return { rise, fall, term: { min, typ: rise.typ - fall.typ, max } }
}

/** An edge that reaches the receiver before the driving edge is an input that cannot be right: rejected, naming the last stage's delay. */
function checkCausality(rise: Corners, fall: Corners, stages: StageContribution[], path: (string | number)[]) {
  if (!stages.length) return
  for (const [edge, d, q] of [
    ['rising', rise, 'tplh'],
    ['falling', fall, 'tphl'],
  ] as const)
    if (d.min < -(1e-15 + 1e-9 * Math.abs(d.max))) {
      // the receiving pin's edge comes from the last stage's output in the same direction
      throw new EngineInputError(
        [...path, 'stages', stages.length - 1, q],
        `the ${edge} edge reaches the receiver ${formatEng(-d.min, 's')} before the driving edge: the last stage's ${q === 'tplh' ? 'tPLH' : 'tPHL'} minimum is too small for its transition time and the receiver's threshold; check ${q}.min and the transition time`,
      )
    }
}

/** Chain PWD at the receiving pin: the receiver's term plus each stage's asymmetry with its sign; worst case and 1-sigma spread. */
function chainPwd(receiverTerm: Corners, stages: StageContribution[]): { min: number; max: number; sigma: number } {
  let min = receiverTerm.min
  let max = receiverTerm.max
  let variance = ((receiverTerm.max - receiverTerm.min) / 6) ** 2
  for (const st of stages) {
    if (st.sign > 0) {
      min += st.asymmetry.min
      max += st.asymmetry.max
    } else {
      min -= st.asymmetry.max
      max -= st.asymmetry.min
    }
    variance += ((st.asymmetry.max - st.asymmetry.min) / 6) ** 2
  }
  return { min, max, sigma: Math.sqrt(variance) }
}

/** A plain input always has a transition limit (the receiver's own, else the common-practice default); a slower received edge is warned. */
function slowEdgeWarning(channel: ChannelSpec, tr: { max: number }, tf: { max: number }): Warning | null {
  const rx = channel.receiver
  if (rx.schmitt) return null
  const limit = rx.maxInputTransition ?? DEFAULT_MAX_INPUT_TRANSITION
  const worst = Math.max(tr.max, tf.max)
  if (worst <= limit) return null
  return {
    code: 'slow-edge',
    channel: channel.id,
    message: `Channel '${channel.id}': the received ${tr.max >= tf.max ? 'rise' : 'fall'} time ${formatEng(worst, 's')} exceeds ${rx.maxInputTransition !== undefined ? "the receiver's maximum input transition" : 'the default limit for a plain CMOS input (no maximum input transition given)'} ${formatEng(limit, 's')} on a non-Schmitt input; the input may oscillate or draw shoot-through current. Use a Schmitt-trigger input or buffer, or a faster edge (smaller pull-up).`,
  }
}

/** A channel whose logic level arrives inverted (the chain's polarity against the receiver's own inversion). */
function polarityWarning(channel: ChannelSpec, polarity: 'kept' | 'inverted', stages: StageContribution[]): Warning | null {
  if ((polarity === 'inverted') === (channel.receiver.invert ?? false)) return null
  const nInv = stages.filter((st) => st.inverting).length
  return {
    code: 'inverted-polarity',
    channel: channel.id,
    message:
      polarity === 'inverted'
        ? `Channel '${channel.id}' ends inverted (${nInv} inverting stage${nInv === 1 ? '' : 's'}) and its receiver does not invert: the line idles at the wrong level and every bit reads inverted. Fix it with a second inverting stage in the chain, or by enabling the receiver's inversion.`
        : `Channel '${channel.id}' keeps its polarity but the receiver is set to invert: every bit reads inverted. Turn the receiver's inversion off, or add an inverting stage.`,
  }
}

/** One stage: reduced to its edge model, its input thresholds read, both output edges launched. */
function propagateStage(channel: ChannelSpec, i: number, up: EdgeState, down: EdgeState, th: ThresholdReader, warnings: Warning[], path: (string | number)[]) {
  const stage = channel.stages[i]!
  let reduced
  try {
    reduced = reduceStage(stage, channel.receiver, channel.role)
  } catch (err) {
    if (err instanceof EngineInputError) throw new EngineInputError([...path, 'stages', i, ...err.path], err.message)
    throw err
  }
  const { model, warnings: stageWarnings, operating, coupler } = reduced
  // a stage's own warnings carry code and message; the chain adds where they come from
  for (const w of stageWarnings) warnings.push({ code: w.code, message: w.message, channel: channel.id, stage: i })
  const input = stageInputThresholds(stage, up, down, th)
  const asym = stageAsymmetry(model, stage.name, (message) => warnings.push({ code: 'other', channel: channel.id, stage: i, message }))
  const r = stageOutput(model, 'rise', up, down, input.rise, input.fall)
  const f = stageOutput(model, 'fall', up, down, input.rise, input.fall)
  const contribution: StageContribution = {
    index: i,
    name: stage.name,
    kind: stage.kind,
    inverting: model.inverting,
    model,
    asymmetry: { min: r.offset.min - f.offset.max + asym.min, typ: r.offset.typ - f.offset.typ + asym.typ, max: r.offset.max - f.offset.min + asym.max },
    sign: 1,
    ...(operating ? { operating } : {}),
    ...(coupler ? { coupler } : {}),
  }
  return { contribution, up: r.edge, down: f.edge }
}

/**
 * Propagate a channel's edges and build its chain result.
 * @param channel the validated channel (schema defaults applied)
 * @param options.path where the channel sits in the link (['channels', i]): an input that
 *   cannot be computed is rejected with an EngineInputError naming the field under it
 */
export function analyzeChain(channel: ChannelSpec, options: { path?: (string | number)[] } = {}): ChainAnalysis {
  const path = options.path ?? []
  const rx = channel.receiver
  const warnings: Warning[] = []
  const th = new ThresholdReader(channel.id, warnings)

  // The driving pin: an ideal edge (its 50 % crossing is the time reference), 0..VDD.
  let up: EdgeState = { delay: { min: 0, typ: 0, max: 0 }, transition: { typ: 0, max: 0 }, shape: 'ramp', vLow: 0, vHigh: rx.vdd }
  let down: EdgeState = { ...up }
  const stages: StageContribution[] = []
  for (let i = 0; i < channel.stages.length; i++) {
    const next = propagateStage(channel, i, up, down, th, warnings, path)
    stages.push(next.contribution)
    up = next.up
    down = next.down
  }
  const polarity = assignSigns(stages)
  const recv = receiverOffsets(rx, up, down, th)
  const rise = add(up.delay, recv.rise)
  const fall = add(down.delay, recv.fall)
  if (th.reachable) checkCausality(rise, fall, stages, path)
  else {
    // a chain that cannot switch reports no negative time (its margins are not computed)
    for (const d of [rise, fall]) {
      d.min = Math.max(0, d.min)
      d.typ = Math.max(d.min, d.typ)
      d.max = Math.max(d.typ, d.max)
    }
  }
  const pwd = chainPwd(recv.term, stages)
  const tr = { ...up.transition }
  const tf = { ...down.transition }
  for (const w of [slowEdgeWarning(channel, tr, tf), polarityWarning(channel, polarity, stages)]) if (w) warnings.push(w)

  return {
    id: channel.id,
    role: channel.role,
    rise,
    fall,
    pwd: { min: pwd.min, max: pwd.max },
    pwdTyp: rise.typ - fall.typ,
    pwdSigma: pwd.sigma,
    polarity,
    tr,
    tf,
    riseShape: up.shape,
    fallShape: down.shape,
    jitterRms: Math.sqrt(stages.reduce((v, st) => v + st.model.jitterRms ** 2, 0)),
    jitterPeak: stages.reduce((v, st) => v + st.model.jitterPeak, 0),
    partSkew: stages.reduce((v, st) => v + st.model.partSkew, 0),
    warnings,
    stages,
    receiverTerm: recv.term,
    reachable: th.reachable,
  }
}
