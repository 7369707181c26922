/**
 * "Apply to stage": turn a capture's measured result into a change of one stage of a
 * link spec (timing-model.md section 6). Pure: the UI shows the changes and saves the new
 * spec through the normal link PATCH with its version, so concurrent edits still get a
 * 409 instead of being overwritten.
 *
 * - `typical`: a digital stage takes the measured tPLH / tPHL as its typical values and
 *   spread: typ = mean, min / max = the wider of the measured extremes and mean -+ 3 sigma
 *   (the engine's convention that min/max are +-3 sigma, timing-model.md section 1);
 *   tr / tf (when measured) as typ = mean, max likewise.
 * - `characterization`: a phototransistor stage gets a characterisation point (RL, tPLH,
 *   tPHL, tr, tf) at the RL the capture was taken at, with the conditions of the board it
 *   was taken on (the stage's LED current, load, supply and base-emitter resistor); a point
 *   at the same conditions (within 1 %) is replaced.
 */
import type { CaptureResultSummary, SummaryStats } from '../types/capture'
import type { CharacterizationPoint, DelaySpec, Link, TransitionSpec } from '../schemas/link'
import { ledCurrentOf, phototransistorInverts } from './coupler'

export type ApplyMode = 'typical' | 'characterization'

export interface StageRef {
  /** index into spec.channels */
  channel: number
  /** index into that channel's stages */
  stage: number
}

export interface AppliedCapture {
  spec: Link
  /** what changed, in words, for the confirmation dialog and the audit */
  changes: string[]
  warnings: string[]
}

/** Delay corners from measured statistics (seconds). */
export function delayCorners(s: SummaryStats): DelaySpec {
  return { min: Math.max(0, Math.min(s.min, s.mean - 3 * s.sigma)), typ: s.mean, max: Math.max(s.max, s.mean + 3 * s.sigma) }
}

/** Transition time from measured statistics (seconds). */
export function transitionOf(s: SummaryStats): TransitionSpec {
  return { typ: s.mean, max: Math.max(s.max, s.mean + 3 * s.sigma) }
}

const us = (s: number) => `${(s * 1e6).toPrecision(4)} µs`

/**
 * The capture's measured polarity against the stage it would be applied to: a sentence
 * when they differ (the wrong channels were paired, or the stage is wired the other way),
 * null when they agree or the capture did not pair its channels. Shown before applying.
 */
export function polarityMismatch(spec: Link, at: StageRef, result: CaptureResultSummary): string | null {
  const p = result.pairing
  const stage = spec.channels[at.channel]?.stages[at.stage]
  if (!p || !stage) return null
  const stageInverts =
    stage.kind === 'digital' ? stage.inverting : stage.kind === 'phototransistor' ? phototransistorInverts(stage.wiring ?? 'collector', stage.ledOnWhen ?? 'high') : null
  if (stageInverts === null || stageInverts === p.inverting) return null
  return `the capture shows a${p.inverting ? 'n inverting' : ' non-inverting'} path but the stage is set ${stageInverts ? 'inverting' : 'non-inverting'}; check the wiring or the channels`
}

export function applyCaptureToStage(spec: Link, at: StageRef, result: CaptureResultSummary, mode: ApplyMode, opts: { rl?: number } = {}): AppliedCapture {
  const p = result.pairing
  if (!p) throw new Error('the capture has no input/output pairing: upload it with an input and an output channel')
  if (!p.tPLH || !p.tPHL) throw new Error('the capture needs both output directions (tPLH and tPHL) to be applied')
  const out = result.channels[p.output]
  // a JSON copy: the spec is plain data, and the UI passes a reactive proxy (which structuredClone refuses)
  const next = JSON.parse(JSON.stringify(spec)) as Link
  const stage = next.channels[at.channel]?.stages[at.stage]
  if (!stage) throw new Error(`channel ${at.channel + 1} has no stage ${at.stage + 1}`)
  const changes: string[] = []
  const warnings: string[] = [...result.warnings]
  const mismatch = polarityMismatch(spec, at, result)
  if (mismatch) warnings.push(mismatch)
  if (mode === 'typical') {
    if (stage.kind !== 'digital') throw new Error(`typical values apply to a digital stage; "${stage.name}" is ${stage.kind === 'phototransistor' ? 'a phototransistor stage: add a characterisation point instead' : `a ${stage.kind} stage`}`)
    stage.tplh = delayCorners(p.tPLH)
    stage.tphl = delayCorners(p.tPHL)
    changes.push(`tPLH ${us(stage.tplh.min)} / ${us(stage.tplh.typ)} / ${us(stage.tplh.max)} (n ${p.tPLH.count})`, `tPHL ${us(stage.tphl.min)} / ${us(stage.tphl.typ)} / ${us(stage.tphl.max)} (n ${p.tPHL.count})`)
    if (out?.tr) {
      stage.tr = transitionOf(out.tr)
      changes.push(`tr ${us(stage.tr.typ)} typ, ${us(stage.tr.max)} max`)
    }
    if (out?.tf) {
      stage.tf = transitionOf(out.tf)
      changes.push(`tf ${us(stage.tf.typ)} typ, ${us(stage.tf.max)} max`)
    }
  } else {
    if (stage.kind !== 'phototransistor') throw new Error(`a characterisation point applies to a phototransistor stage; "${stage.name}" is a ${stage.kind} stage`)
    const rl = opts.rl
    if (rl === undefined || !(rl > 0)) throw new Error('give the pull-up RL the capture was taken at')
    // the capture was taken on this board: the stage's own conditions
    const ledCurrent = ledCurrentOf(stage)
    const point: CharacterizationPoint = {
      rl,
      ...(ledCurrent > 0 ? { ledCurrent } : {}),
      loadCap: stage.loadCap ?? 0,
      vcc: stage.vcc,
      ...(stage.rbe !== undefined ? { rbe: stage.rbe } : {}),
      tplh: p.tPLH.mean,
      tphl: p.tPHL.mean,
      ...(out?.tr ? { tr: out.tr.mean } : {}),
      ...(out?.tf ? { tf: out.tf.mean } : {}),
    }
    const close = (a: number | undefined, b: number | undefined) => (a === undefined || b === undefined ? a === b : Math.abs(a - b) <= 0.01 * Math.max(Math.abs(a), Math.abs(b)))
    const i = stage.characterization.findIndex(
      (c) => close(c.rl, rl) && close(c.ledCurrent, point.ledCurrent) && close(c.loadCap ?? 0, point.loadCap) && close(c.vcc ?? stage.vcc, stage.vcc) && close(c.rbe, point.rbe),
    )
    if (i >= 0) {
      stage.characterization[i] = point
      changes.push(`characterisation point at RL ${rl} ohm and these conditions replaced`)
    } else {
      if (stage.characterization.length >= 32) throw new Error('the stage already has 32 characterisation points')
      stage.characterization.push(point)
      stage.characterization.sort((a, b) => a.rl - b.rl)
      changes.push(`characterisation point added at RL ${rl} ohm`)
    }
    changes.push(`tPLH ${us(point.tplh!)}, tPHL ${us(point.tphl!)}${point.tr !== undefined ? `, tr ${us(point.tr)}` : ''}${point.tf !== undefined ? `, tf ${us(point.tf)}` : ''}`)
  }
  return { spec: next, changes, warnings }
}
