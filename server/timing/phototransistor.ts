/**
 * Phototransistor coupler stage (timing-model.md section 5): the LED and output
 * operating point, the absolute-maximum checks, and the switching times fitted from
 * the user's characterisation points, reduced to the chain's StageEdgeModel.
 *
 * Assumptions (also returned by `phototransistorAssumptions()` for the report):
 * - Datasheet curves of tPLH / tPHL / tr / tf against RL are typical values. The
 *   fitted value is the typical corner. When the stage states `partSkew` (spread
 *   between the shortest and the longest delay across parts), the delay corners are
 *   typ -/+ partSkew/2; otherwise they are typ x (1 -/+ TYPICAL_SPREAD). Transition
 *   times get max = typ x (1 + TYPICAL_SPREAD) either way.
 * - CTR is taken at its stated minimum times both derating factors, independent of
 *   the LED current (the stage has no CTR-versus-IF curve); a warning says so when
 *   the LED runs well below the CTR test current.
 * - The load-capacitance term applies to the passive direction only (the pull-up or
 *   emitter resistor charging the load): 2.197 RL dC on its transition time and
 *   0.693 RL dC on its delay, dC = stage load minus the point's load.
 * - Power is the static on-state dissipation (LED held on), worst case over every
 *   part whose CTR is at least the derated minimum.
 */
import type { PhototransistorStage } from '../../shared/schemas/link'
import type { Corners, EdgeShape, StageEdgeModel, Warning } from './types'

/** Relative spread of a typical curve value used for min/max when no partSkew is given. */
export const TYPICAL_SPREAD = 0.3

/** ln 9: 10-90 % time of a single-pole exponential edge, in units of tau. */
const LN9 = Math.log(9)
/** ln 2: 50 % point of a single-pole exponential edge, in units of tau. */
const LN2 = Math.LN2

/** One of the four characterised quantities. */
export type CharQuantity = 'tplh' | 'tphl' | 'tr' | 'tf'
export const CHAR_QUANTITIES: readonly CharQuantity[] = ['tplh', 'tphl', 'tr', 'tf']

/** A straight-line fit t = a + b * RL of one characterised quantity. */
export interface LinearFit {
  quantity: CharQuantity
  /** least-squares: a + b*RL over >= 2 distinct RL; proportional: one RL, t = b*RL; none: no point */
  method: 'least-squares' | 'proportional' | 'none'
  /** intercept, seconds */
  a: number
  /** slope, seconds per ohm */
  b: number
  /** number of points used */
  points: number
  /** RL range of the points, ohms (0 when no point) */
  rlMin: number
  rlMax: number
  /** root-mean-square residual of the fit, seconds (0 for one point) */
  rmsResidual: number
  /** largest absolute residual, seconds */
  maxResidual: number
}

/** Which output direction is passive (a resistor charges the load): follows from the wiring. */
export function passiveDirection(wiring: 'collector' | 'emitter'): 'rise' | 'fall' {
  // collector pull-up: the transistor pulls down actively, RL pulls up passively;
  // emitter resistor: the transistor pulls up actively, RL discharges the load.
  return wiring === 'emitter' ? 'fall' : 'rise'
}

/** Whether the stage inverts: collector wiring inverts, emitter does not; an LED lit by a low input flips it. */
export function phototransistorInverts(wiring: 'collector' | 'emitter', ledOnWhen: 'high' | 'low'): boolean {
  const wiringInverts = wiring !== 'emitter'
  return ledOnWhen === 'low' ? !wiringInverts : wiringInverts
}

/** Least-squares straight line through (rl, t) points; one distinct RL gives t proportional to RL. */
export function fitLine(quantity: CharQuantity, pts: ReadonlyArray<{ rl: number; t: number }>): LinearFit {
  const n = pts.length
  if (n === 0) return { quantity, method: 'none', a: 0, b: 0, points: 0, rlMin: 0, rlMax: 0, rmsResidual: 0, maxResidual: 0 }
  let rlMin = Infinity
  let rlMax = -Infinity
  let sx = 0
  let sy = 0
  for (const p of pts) {
    rlMin = Math.min(rlMin, p.rl)
    rlMax = Math.max(rlMax, p.rl)
    sx += p.rl
    sy += p.t
  }
  const mx = sx / n
  const my = sy / n
  let sxx = 0
  let sxy = 0
  for (const p of pts) {
    sxx += (p.rl - mx) * (p.rl - mx)
    sxy += (p.rl - mx) * (p.t - my)
  }
  let a: number
  let b: number
  let method: LinearFit['method']
  // distinct RL values: the spread must be more than rounding noise of the RL values
  if (rlMax - rlMin > 1e-9 * rlMax && sxx > 0) {
    b = sxy / sxx
    a = my - b * mx
    method = 'least-squares'
  } else {
    // one RL (possibly repeated): switching time scaled in proportion to RL
    a = 0
    b = my / mx
    method = 'proportional'
  }
  let ss = 0
  let maxResidual = 0
  for (const p of pts) {
    const r = p.t - (a + b * p.rl)
    ss += r * r
    maxResidual = Math.max(maxResidual, Math.abs(r))
  }
  return { quantity, method, a, b, points: n, rlMin, rlMax, rmsResidual: Math.sqrt(ss / n), maxResidual }
}

/** Evaluate a fit at RL, seconds (never below 0). */
export function evalFit(fit: LinearFit, rl: number): number {
  return Math.max(0, fit.a + fit.b * rl)
}

type StageLike = Pick<PhototransistorStage, 'characterization'> & {
  wiring?: 'collector' | 'emitter'
  loadCap?: number
}

/**
 * Fit every characterised quantity of a stage as t = a + b*RL. Each point is first
 * moved to the stage's load capacitance (the passive direction's tr/tf and delay get
 * the RC term for the point's own load difference), so points taken at different
 * loads fit one line.
 */
export function fitCharacterization(stage: StageLike): Record<CharQuantity, LinearFit> {
  const passive = passiveDirection(stage.wiring ?? 'collector')
  const cStage = stage.loadCap ?? 0
  const out = {} as Record<CharQuantity, LinearFit>
  for (const q of CHAR_QUANTITIES) {
    const pts: { rl: number; t: number }[] = []
    for (const p of stage.characterization) {
      const t = p[q]
      if (t === undefined) continue
      const dC = cStage - (p.loadCap ?? cStage)
      pts.push({ rl: p.rl, t: t + loadTerm(q, passive, p.rl, dC) })
    }
    out[q] = fitLine(q, pts)
  }
  return out
}

/** The load-capacitance correction of one quantity, seconds (may be negative for a lighter load). */
function loadTerm(q: CharQuantity, passive: 'rise' | 'fall', rl: number, dC: number): number {
  if (dC === 0) return 0
  if (passive === 'rise') {
    if (q === 'tr') return LN9 * rl * dC
    if (q === 'tplh') return LN2 * rl * dC
  } else {
    if (q === 'tf') return LN9 * rl * dC
    if (q === 'tphl') return LN2 * rl * dC
  }
  return 0
}

/** Static operating point of the stage. */
export interface PhototransistorOperating {
  /** LED forward current, amperes */
  ledCurrent: number
  /** collector current needed to pull the output to VCE(sat), amperes */
  icRequired: number
  /** collector current available with the derated minimum CTR, amperes */
  icAvailable: number
  /** icAvailable / icRequired (>= 1 saturates) */
  overdrive: number
  saturated: boolean
  /** static on-state package dissipation (LED + transistor), watts */
  power: number
}

/** The assumptions this module makes, in words for the report. */
export function phototransistorAssumptions(): string[] {
  const pct = Math.round(TYPICAL_SPREAD * 100)
  return [
    `Phototransistor switching times are typical curve values: delay corners are typ -/+ partSkew/2 when partSkew is given, else typ -/+ ${pct} %; transition max = typ + ${pct} %.`,
    'Phototransistor CTR is the stated minimum times the temperature and end-of-life derating, independent of LED current.',
    'The load-capacitance correction (2.197 RL dC on the transition, 0.693 RL dC on the delay) applies to the passive output direction only.',
    'Coupler power is the static on-state dissipation, worst case over parts with at least the derated minimum CTR.',
  ]
}

const eng = (v: number, unit: string): string => {
  const a = Math.abs(v)
  const [s, p] =
    a === 0 ? [1, ''] : a >= 1e6 ? [1e-6, 'M'] : a >= 1e3 ? [1e-3, 'k'] : a >= 1 ? [1, ''] : a >= 1e-3 ? [1e3, 'm'] : a >= 1e-6 ? [1e6, 'u'] : [1e9, 'n']
  return `${Number((v * s).toPrecision(3))} ${p}${unit}`
}

/** LED forward current from the drive: (Vdrive - VF) / R_LED, or the stated current. */
export function ledCurrentOf(stage: Pick<PhototransistorStage, 'driveVoltage' | 'vf' | 'rLed' | 'ledCurrent'>): number {
  if (stage.rLed !== undefined) return Math.max(0, (stage.driveVoltage - stage.vf) / stage.rLed)
  return Math.max(0, stage.ledCurrent ?? 0)
}

/** Product of the CTR derating factors (defaults 1). */
export function ctrDeratingOf(stage: Pick<PhototransistorStage, 'ctrDerating'>): number {
  const d = stage.ctrDerating as { temperature?: number; endOfLife?: number } | undefined
  return (d?.temperature ?? 1) * (d?.endOfLife ?? 1)
}

/**
 * The phototransistor stage reduced to the chain's edge model, with its warnings and
 * static operating point. `stage` is the validated schema object (defaults may be
 * missing: they are applied here as the schema states them).
 */
export function phototransistorModel(stage: PhototransistorStage): {
  model: StageEdgeModel
  warnings: Warning[]
  operating: PhototransistorOperating
} {
  const warnings: Warning[] = []
  const wiring = stage.wiring ?? 'collector'
  const ledOnWhen = stage.ledOnWhen ?? 'high'
  const vceSat = stage.vceSat ?? 0.4
  const loadCap = stage.loadCap ?? 0
  const { vcc, rl } = stage

  // ---- static operating point (section 5, static checks)
  const ledCurrent = ledCurrentOf(stage)
  if (stage.rLed !== undefined && stage.ledCurrent !== undefined) {
    const fromR = ledCurrent
    if (Math.abs(fromR - stage.ledCurrent) > 0.01 * Math.max(fromR, stage.ledCurrent))
      warnings.push({
        code: 'other',
        message: `LED current ${eng(stage.ledCurrent, 'A')} disagrees with (drive - VF)/rLed = ${eng(fromR, 'A')}; rLed is used.`,
      })
  }
  if (stage.driveVoltage <= stage.vf && stage.rLed !== undefined)
    warnings.push({
      code: 'unsaturated',
      message: `Drive voltage ${eng(stage.driveVoltage, 'V')} does not exceed the LED forward voltage ${eng(stage.vf, 'V')}: the LED never lights.`,
    })
  const swingV = Math.max(0, vcc - vceSat)
  const icRequired = swingV / rl
  const icAvailable = stage.ctrMin * ctrDeratingOf(stage) * ledCurrent
  // no swing (VCC <= VCE(sat)) cannot be driven at all: overdrive 0, not saturated
  const overdrive = icRequired > 0 ? icAvailable / icRequired : 0
  const saturated = icRequired > 0 && ledCurrent > 0 && icAvailable >= icRequired
  if (vcc <= vceSat)
    warnings.push({
      code: 'other',
      message: `Output supply ${eng(vcc, 'V')} is not above VCE(sat) ${eng(vceSat, 'V')}: the output has no swing.`,
    })
  if (!saturated)
    warnings.push({
      code: 'unsaturated',
      message: `Output does not saturate: derated CTR gives ${eng(icAvailable, 'A')} but (VCC - VCE(sat))/RL needs ${eng(icRequired, 'A')} (overdrive ${overdrive.toFixed(2)}). Raise the LED current or the pull-up resistance.`,
    })
  if (stage.ctrTestCurrent !== undefined && ledCurrent > 0 && ledCurrent < 0.5 * stage.ctrTestCurrent)
    warnings.push({
      code: 'other',
      message: `LED current ${eng(ledCurrent, 'A')} is well below the CTR test current ${eng(stage.ctrTestCurrent, 'A')}; CTR usually falls at low current, so the stated minimum may not hold.`,
    })

  // Collector current in service: the load limits it to icRequired once saturated; a
  // part at the derated minimum CTR gives icAvailable. Power worst case over that range.
  const icLow = Math.min(icAvailable, icRequired)
  let pT = Math.max(transistorPower(icLow, vcc, vceSat, rl), transistorPower(icRequired, vcc, vceSat, rl))
  const icPeak = vcc / (2 * rl) // maximum of ic*(vcc - ic*rl)
  if (icPeak > icLow && icPeak < icRequired) pT = Math.max(pT, transistorPower(icPeak, vcc, vceSat, rl))
  const power = ledCurrent * stage.vf + pT

  absMax(warnings, ledCurrent, stage.ledCurrentMax, 'LED current', 'A')
  absMax(warnings, icRequired, stage.collectorCurrentMax, 'Collector current', 'A')
  absMax(warnings, power, stage.powerMax, 'Coupler power', 'W')
  absMax(warnings, ledCurrent, stage.driverCurrentMax, 'Driving pin current', 'A')

  // ---- switching times (section 5, timing)
  const passive = passiveDirection(wiring)
  const fits = fitCharacterization(stage)
  const typ = {} as Record<CharQuantity, number>
  for (const q of CHAR_QUANTITIES) {
    const fit = fits[q]
    if (fit.method === 'none') continue
    typ[q] = evalFit(fit, rl)
    if (fit.a + fit.b * rl < 0)
      warnings.push({ code: 'extrapolation', message: `The ${label(q)} fit goes below zero at RL ${eng(rl, 'ohm')}; 0 is used.` })
    if (fit.method === 'proportional')
      warnings.push({
        code: 'single-point-fit',
        message: `${label(q)} has one characterisation RL (${eng(fit.rlMin, 'ohm')}); it is scaled in proportion to RL, an extrapolation${rel(rl, fit.rlMin) ? ' for any other RL' : ` to ${eng(rl, 'ohm')}`}. Enter a second point.`,
      })
    if ((rl < fit.rlMin && !rel(rl, fit.rlMin)) || (rl > fit.rlMax && !rel(rl, fit.rlMax)))
      warnings.push({
        code: 'extrapolation',
        message: `RL ${eng(rl, 'ohm')} is outside the characterised range ${eng(fit.rlMin, 'ohm')}..${eng(fit.rlMax, 'ohm')} of ${label(q)}: extrapolated.`,
      })
  }
  // A quantity without any point: estimate it from the others and say so.
  const passiveTr: CharQuantity = passive === 'rise' ? 'tr' : 'tf'
  const passiveD: CharQuantity = passive === 'rise' ? 'tplh' : 'tphl'
  const activeTr: CharQuantity = passive === 'rise' ? 'tf' : 'tr'
  const activeD: CharQuantity = passive === 'rise' ? 'tphl' : 'tplh'
  if (typ[passiveTr] === undefined) {
    typ[passiveTr] = typ[passiveD] !== undefined ? (typ[passiveD] * LN9) / LN2 : LN9 * rl * loadCap
    warnings.push({
      code: 'other',
      message: `${label(passiveTr)} is not characterised: estimated as an exponential edge from ${typ[passiveD] !== undefined ? label(passiveD) : 'RL and the load capacitance alone (a lower bound)'}.`,
    })
  }
  if (typ[passiveD] === undefined) {
    typ[passiveD] = (typ[passiveTr] * LN2) / LN9
    warnings.push({
      code: 'other',
      message: `${label(passiveD)} is not characterised: estimated as the 50 % point of the passive edge (a lower bound).`,
    })
  }
  for (const t of [activeTr, activeD]) {
    if (typ[t] === undefined) {
      typ[t] = 0
      warnings.push({
        code: 'other',
        message: `${label(t)} is not characterised: taken as 0 (an optimistic bound); enter it from the datasheet.`,
      })
    }
  }

  // ---- output swing: collector wiring VCE(sat)..VCC, emitter wiring 0..VCC - VCE(sat);
  // an unsaturated output only reaches what the derated current can pull across RL.
  let vLow: number
  let vHigh: number
  if (wiring === 'collector') {
    vHigh = vcc
    vLow = saturated ? vceSat : Math.max(vceSat, vcc - icAvailable * rl)
  } else {
    vLow = 0
    vHigh = saturated ? swingV : Math.min(swingV, icAvailable * rl)
  }
  if (stage.vLow !== undefined) vLow = stage.vLow
  if (stage.vHigh !== undefined) vHigh = stage.vHigh

  const riseShape: EdgeShape = passive === 'rise' ? 'exponential' : 'ramp'
  const fallShape: EdgeShape = passive === 'fall' ? 'exponential' : 'ramp'
  const model: StageEdgeModel = {
    inverting: phototransistorInverts(wiring, ledOnWhen),
    tplh: delayCorners(typ.tplh, stage.partSkew),
    tphl: delayCorners(typ.tphl, stage.partSkew),
    tr: transition(typ.tr),
    tf: transition(typ.tf),
    riseShape,
    fallShape,
    vLow,
    vHigh,
    partSkew: stage.partSkew ?? 0,
    jitterRms: stage.jitterRms ?? 0,
    jitterPeak: stage.jitterPeak ?? 0,
  }
  return { model, warnings, operating: { ledCurrent, icRequired, icAvailable, overdrive, saturated, power } }
}

/** Static transistor dissipation at collector current ic: ic * VCE, VCE the larger of VCE(sat) and what RL leaves. */
function transistorPower(ic: number, vcc: number, vceSat: number, rl: number): number {
  return ic * Math.max(vceSat, vcc - ic * rl)
}

/** Warn when a value exceeds its stated absolute maximum. */
function absMax(warnings: Warning[], value: number, limit: number | undefined, what: string, unit: string): void {
  if (limit !== undefined && value > limit)
    warnings.push({ code: 'absolute-maximum', message: `${what} ${eng(value, unit)} exceeds its absolute maximum ${eng(limit, unit)}.` })
}

/** Equal within 1e-6 relative (an RL at the edge of the characterised range is inside it). */
function rel(x: number, y: number): boolean {
  return Math.abs(x - y) <= 1e-6 * Math.max(x, y)
}

/** Delay corners of a typical curve value: typ -/+ partSkew/2 (never below 0), else typ -/+ TYPICAL_SPREAD. */
function delayCorners(t: number, skew: number | undefined): Corners {
  return skew !== undefined
    ? { min: Math.max(0, t - skew / 2), typ: t, max: t + skew / 2 }
    : { min: t * (1 - TYPICAL_SPREAD), typ: t, max: t * (1 + TYPICAL_SPREAD) }
}

/** Transition time of a typical curve value: max = typ + TYPICAL_SPREAD. */
function transition(t: number): { typ: number; max: number } {
  return { typ: t, max: t * (1 + TYPICAL_SPREAD) }
}

function label(q: CharQuantity): string {
  return q === 'tplh' ? 'tPLH' : q === 'tphl' ? 'tPHL' : q === 'tr' ? 'tr' : 'tf'
}
