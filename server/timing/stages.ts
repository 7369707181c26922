/**
 * Every stage kind reduced to the chain's StageEdgeModel (timing-model.md section 1):
 *
 * - digital: the datasheet's inverting flag, tPLH / tPHL corners, PWD max, tr / tf and
 *   edge shape, as entered;
 * - wire: a symmetric delay length * delayPerMeter that passes the edge on unchanged;
 * - rc: a resistor charging a capacitance in the passive direction, an exponential edge
 *   with tr = RC ln 9 and its 50 % point 0.693 RC (RC ln 2) after the switch releases;
 *   the active direction passes the driving edge on with no added delay;
 * - phototransistor: the phototransistor module's model (operating point, fits);
 * - transceiver: the driver's delay in a txd channel, the receiver's in an rxd channel, none in
 *   a de channel (its enable and disable times count there), both in turn elsewhere; the skew
 *   bounds each part's |tPLH - tPHL|.
 */
import type { ChannelRole, ChannelSpec, DigitalStage, RcStage, StageSpec, TransceiverStage, WireStage } from '../../shared/schemas/link'
import { LN2, LN9 } from './edges'
import { phototransistorModel, type CouplerModelInfo, type PhototransistorOperating } from './phototransistor'
import type { Corners, StageEdgeModel, Warning } from './types'

export interface StageReduction {
  model: StageEdgeModel
  warnings: Warning[]
  /** static operating point, phototransistor stages only */
  operating?: PhototransistorOperating
  /** the calibrated coupler model, phototransistor stages only */
  coupler?: CouplerModelInfo
}

const fixed = (t: number): Corners => ({ min: t, typ: t, max: t })
const ideal = { typ: 0, max: 0 }

/**
 * What every non-phototransistor stage states the same way: its output swing (default 0 V to the
 * receiver's supply), the part-to-part skew and the jitter (default none).
 */
function outputOf(stage: StageSpec, receiverVdd: number): Pick<StageEdgeModel, 'vLow' | 'vHigh' | 'partSkew' | 'jitterRms' | 'jitterPeak'> {
  return { vLow: stage.vLow ?? 0, vHigh: stage.vHigh ?? receiverVdd, partSkew: stage.partSkew ?? 0, jitterRms: stage.jitterRms ?? 0, jitterPeak: stage.jitterPeak ?? 0 }
}

/** A digital stage (coupler with logic output, digital isolator, buffer) as entered. */
export function digitalStageModel(stage: DigitalStage, receiverVdd: number): StageEdgeModel {
  const shape = stage.edge ?? 'ramp'
  return {
    inverting: stage.inverting ?? false,
    tplh: { ...stage.tplh },
    tphl: { ...stage.tphl },
    ...(stage.pwdMax !== undefined ? { pwdMax: stage.pwdMax } : {}),
    tr: stage.tr ? { typ: stage.tr.typ, max: stage.tr.max } : { ...ideal },
    tf: stage.tf ? { typ: stage.tf.typ, max: stage.tf.max } : { ...ideal },
    riseShape: shape,
    fallShape: shape,
    ...outputOf(stage, receiverVdd),
  }
}

/** A wire: symmetric delay length * delayPerMeter (default 5 ns/m), no distortion. */
export function wireStageModel(stage: WireStage, receiverVdd: number): StageEdgeModel {
  const d = stage.length * (stage.delayPerMeter ?? 5e-9)
  return {
    inverting: false,
    tplh: fixed(d),
    tphl: fixed(d),
    tr: { ...ideal },
    tf: { ...ideal },
    riseShape: 'ramp',
    fallShape: 'ramp',
    ...outputOf(stage, receiverVdd),
    passThrough: { rise: true, fall: true },
  }
}

/**
 * An RC node (an open-drain output with a pull-up, a filter): in the passive direction
 * v(t) = V(1 - e^(-t/RC)) from the instant the driver releases, so tr = RC ln 9 and the
 * 50 % point is RC ln 2 later; the active direction is the driver's own edge.
 */
export function rcStageModel(stage: RcStage, receiverVdd: number): StageEdgeModel {
  const rc = stage.r * stage.c
  const passiveRise = (stage.passive ?? 'rise') === 'rise'
  const passiveEdge = { typ: rc * LN9, max: rc * LN9 }
  return {
    inverting: false,
    tplh: fixed(passiveRise ? rc * LN2 : 0),
    tphl: fixed(passiveRise ? 0 : rc * LN2),
    tr: passiveRise ? passiveEdge : { ...ideal },
    tf: passiveRise ? { ...ideal } : passiveEdge,
    riseShape: passiveRise ? 'exponential' : 'ramp',
    fallShape: passiveRise ? 'ramp' : 'exponential',
    ...outputOf(stage, receiverVdd),
    passThrough: { rise: !passiveRise, fall: passiveRise },
  }
}

/** The delay a transceiver puts in a channel of `role`: driver, receiver, none or both, with the skew that bounds its PWD. */
export function transceiverDelay(stage: TransceiverStage, role: ChannelRole | undefined): { delay: Corners; pwdMax: number } {
  const d = stage.driverDelay
  const r = stage.receiverDelay
  const skew = stage.skew ?? 0
  if (role === 'txd') return { delay: { ...d }, pwdMax: skew }
  if (role === 'rxd') return { delay: { ...r }, pwdMax: skew }
  if (role === 'de') return { delay: fixed(0), pwdMax: 0 }
  const max = Math.min(d.max + r.max, stage.loopDelayMax ?? Infinity)
  return { delay: { min: d.min + r.min, typ: Math.min(d.typ + r.typ, max), max }, pwdMax: 2 * skew }
}

/** A transceiver: symmetric delay corners for its part of the channel, PWD bounded by its skew, edges re-driven (ideal). */
export function transceiverStageModel(stage: TransceiverStage, role: ChannelRole | undefined, receiverVdd: number): StageEdgeModel {
  const { delay, pwdMax } = transceiverDelay(stage, role)
  return {
    inverting: false,
    tplh: { ...delay },
    tphl: { ...delay },
    pwdMax,
    tr: { ...ideal },
    tf: { ...ideal },
    riseShape: 'ramp',
    fallShape: 'ramp',
    ...outputOf(stage, receiverVdd),
  }
}

/** Reduce one stage of a channel to its edge model, with the stage's own warnings. */
export function reduceStage(stage: StageSpec, receiver: Pick<ChannelSpec['receiver'], 'vdd'>, role?: ChannelRole): StageReduction {
  switch (stage.kind) {
    case 'digital':
      return { model: digitalStageModel(stage, receiver.vdd), warnings: [] }
    case 'wire':
      return { model: wireStageModel(stage, receiver.vdd), warnings: [] }
    case 'rc':
      return { model: rcStageModel(stage, receiver.vdd), warnings: [] }
    case 'transceiver':
      return { model: transceiverStageModel(stage, role, receiver.vdd), warnings: [] }
    case 'phototransistor': {
      const r = phototransistorModel(stage)
      return { model: r.model, warnings: r.warnings, operating: r.operating, coupler: r.coupler }
    }
  }
}
