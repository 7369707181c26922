/**
 * Phototransistor coupler stage (timing-model.md section 5): the LED and output operating
 * point, the absolute-maximum checks, and the switching times predicted by the calibrated
 * charge-control model of `coupler.ts`, reduced to the chain's StageEdgeModel.
 *
 * The model is calibrated from the stage's characterisation points (one point is enough;
 * more are fitted by least squares) and predicts the four times at the stage's own pull-up,
 * LED current, load capacitance and base-emitter resistor. Its corners:
 * - typical: the model at the stage's operating point;
 * - delays: typ -/+ partSkew/2 when partSkew is given, else typ x (1 -/+ TYPICAL_SPREAD);
 *   transitions: max = typ x (1 + TYPICAL_SPREAD);
 * - the corners are widened to cover every hypothesis the engine had to make (without a
 *   stated typical CTR, the model calibrated at each multiple of CTR_TYP_BRACKET), and, outside
 *   the characterised range, the slow corners are never faster than the model at the range's
 *   nearest edge (the range is the box of the points' pull-ups, LED currents and loads).
 */
import type { CharacterizationPoint, PhototransistorStage } from '../../shared/schemas/link'
import {
  CTR_TYP_BRACKET,
  ctrTypOf,
  DEFAULT_HFE,
  driverCurrentMaxOf,
  driverDropOf,
  ledCurrentOf,
  POINT_DEFAULT_LED_CURRENT,
  POINT_DEFAULT_LOAD_CAP,
  rbeDivertedCurrent,
  phototransistorInverts,
  VBE_HIGH,
} from '../../shared/utils/coupler'
import { formatEng } from '../../shared/utils/units'
import {
  calibrate,
  predictSwitching,
  SWITCHING_QUANTITIES,
  type Calibration,
  type CalibrationPoint,
  type ChargeControlParams,
  type CouplerOperatingPoint,
  type CouplerSwitching,
  type SwitchingQuantity,
} from './coupler'
import type { Corners, EdgeShape, StageEdgeModel, Warning } from './types'
import type { PhototransistorOperating, CouplerModelInfo } from '../../shared/types/analysis'
export type { PhototransistorOperating, CouplerModelInfo }

export { ledCurrentOf }

/** Relative spread of a typical value used for min/max when no partSkew is given. */
export const TYPICAL_SPREAD = 0.3

/**
 * The generic phototransistor coupler class (20 % CTR minimum, about 75 % typical, open
 * base) as calibrated from the transistor-level reference `bench/coupler.cir` at 5 V,
 * 4.7 kOhm and 10 mA. A parameter that a stage's points do not determine stays near it.
 */
export const CLASS_PRIOR: ChargeControlParams = { tauS: 7.93e-6, cMiller: 1.27e-9, tauLed: 4.15e-6, qOn: 7.9e-11 }

/** One of the four characterised quantities, named by the OUTPUT's direction. */
export type CharQuantity = 'tplh' | 'tphl' | 'tr' | 'tf'
export const CHAR_QUANTITIES: readonly CharQuantity[] = ['tplh', 'tphl', 'tr', 'tf']

/** Which output direction is passive (a resistor charges the load): follows from the wiring. */
export function passiveDirection(wiring: 'collector' | 'emitter'): 'rise' | 'fall' {
  // collector pull-up: the transistor pulls down actively, RL pulls up passively;
  // emitter resistor: the transistor pulls up actively, RL discharges the load.
  return wiring === 'emitter' ? 'fall' : 'rise'
}

export { phototransistorInverts }

/**
 * The model's quantities (turn-off: tplh, tr; turn-on: tphl, tf, as a collector output
 * sees them) for each output quantity of the stage: a collector output rises when the LED
 * goes dark, an emitter output falls.
 */
function modelQuantity(wiring: 'collector' | 'emitter', q: CharQuantity): SwitchingQuantity {
  if (wiring === 'collector') return q
  return q === 'tplh' ? 'tphl' : q === 'tphl' ? 'tplh' : q === 'tr' ? 'tf' : 'tr'
}



/** Product of the CTR derating factors (defaults 1). */
export function ctrDeratingOf(stage: Pick<PhototransistorStage, 'ctrDerating'>): number {
  const d = stage.ctrDerating as { temperature?: number; endOfLife?: number } | undefined
  return (d?.temperature ?? 1) * (d?.endOfLife ?? 1)
}

/** The assumptions this module makes, in words for the report. */
export function phototransistorAssumptions(): string[] {
  const pct = Math.round(TYPICAL_SPREAD * 100)
  return [
    'Phototransistor switching times come from a charge-control model of the output transistor (storage time constant, Miller capacitance hFE x C_CB, LED and photodiode lag, turn-on charge) calibrated from the stage\'s characterisation points and evaluated at the stage\'s own pull-up, LED current, load capacitance and base-emitter resistor.',
    `Phototransistor delay corners are typ ∓ partSkew/2 when partSkew is given, else typ ∓ ${pct} %; transition max = typ + ${pct} %; the corners also cover every CTR hypothesis, and outside the characterised range the slow corners are held at the range's nearest edge.`,
    'The load capacitance adds to the output node\'s capacitance in the model (RL x C on both edges\' time constant) and is not limited to the characterised loads; only a load lighter than every point\'s holds the slow corners.',
    `A characterisation point without its own conditions is taken at the stage's CTR test current (else ${formatEng(POINT_DEFAULT_LED_CURRENT, 'A')}), an unloaded output (${formatEng(POINT_DEFAULT_LOAD_CAP, 'F')}), the stage's supply and an open base.`,
    `Static check: CTR is the stated minimum times the temperature and end-of-life derating, less hFE x VBE / RBE (VBE ${VBE_HIGH} V) where a base-emitter resistor is fitted; the LED current is (drive - VF - the driver's own drop) / R_LED.`,
    'Coupler power is the static on-state dissipation, worst case over parts with at least the derated minimum CTR.',
  ]
}

const eng = (v: number, unit: string) => formatEng(v, unit)

/** One calibration of the model: the central typical CTR, or one of the bracket's. */
interface CalibratedScenario {
  ctrTyp: number
  calibration: Calibration
}

/**
 * Calibrations are reused across calls with the same points and conditions: the pull-up
 * sweep's rows share one, and live analysis recomputes the same link on every edit.
 * Keyed by content, bounded (oldest dropped first).
 */
const calibrationCache = new Map<string, CalibratedScenario[]>()
const CALIBRATION_CACHE_SIZE = 512
/** The last characterisation array seen and its key (a sweep passes the same array for every row). */
let lastPoints: readonly CharacterizationPoint[] | null = null
let lastPointsKey = ''

/** The resolved conditions of one point. */
function pointOperating(p: CharacterizationPoint, stage: PhototransistorStage, ctrTyp: number, hfe: number): CouplerOperatingPoint {
  return {
    rl: p.rl,
    ledCurrent: p.ledCurrent ?? stage.ctrTestCurrent ?? POINT_DEFAULT_LED_CURRENT,
    loadCap: p.loadCap ?? POINT_DEFAULT_LOAD_CAP,
    vcc: p.vcc ?? stage.vcc,
    vceSat: stage.vceSat ?? 0.4,
    ctrTyp,
    hfe,
    ...(p.rbe !== undefined ? { rbe: p.rbe } : {}),
  }
}

/** Calibrate at the central and (without a stated ctrTyp) the bracket's typical CTRs. */
function scenarios(stage: PhototransistorStage, hfe: number): CalibratedScenario[] {
  const wiring = stage.wiring ?? 'collector'
  const ctrs = stage.ctrTyp !== undefined ? [stage.ctrTyp] : [ctrTypOf(stage), ...CTR_TYP_BRACKET.map((m) => m * stage.ctrMin)]
  if (stage.characterization !== lastPoints) {
    lastPoints = stage.characterization
    lastPointsKey = JSON.stringify(stage.characterization)
  }
  const key = `${wiring}|${stage.vcc}|${stage.vceSat}|${stage.ctrTestCurrent}|${hfe}|${ctrs.join(',')}|${lastPointsKey}`
  const hit = calibrationCache.get(key)
  if (hit) {
    // refresh its place as the most recently used
    calibrationCache.delete(key)
    calibrationCache.set(key, hit)
    return hit
  }
  const out: CalibratedScenario[] = []
  for (const ctrTyp of ctrs) {
    const points: CalibrationPoint[] = stage.characterization.map((p) => {
      const cp: CalibrationPoint = { op: pointOperating(p, stage, ctrTyp, hfe) }
      for (const q of CHAR_QUANTITIES) {
        const v = p[q]
        if (v !== undefined) cp[modelQuantity(wiring, q)] = v
      }
      return cp
    })
    out.push({ ctrTyp, calibration: calibrate(points, CLASS_PRIOR, out[0]?.calibration.params) })
  }
  calibrationCache.set(key, out)
  if (calibrationCache.size > CALIBRATION_CACHE_SIZE) calibrationCache.delete(calibrationCache.keys().next().value!)
  return out
}

const clampTo = (v: number, [lo, hi]: [number, number]) => Math.min(hi, Math.max(lo, v))
const outside = (v: number, [lo, hi]: [number, number]) => v < lo * (1 - 1e-6) || v > hi * (1 + 1e-6)

/** The static operating point (section 5, static checks) with its warnings and absolute-maximum checks. */
function staticOperatingPoint(stage: PhototransistorStage, hfe: number, warnings: Warning[]): PhototransistorOperating & { diverted: number; swingV: number } {
  const vceSat = stage.vceSat ?? 0.4
  const { vcc, rl } = stage
  const ledCurrent = ledCurrentOf(stage)
  if (stage.rLed !== undefined && stage.ledCurrent !== undefined && Math.abs(ledCurrent - stage.ledCurrent) > 0.01 * Math.max(ledCurrent, stage.ledCurrent))
    warnings.push({ code: 'other', message: `LED current ${eng(stage.ledCurrent, 'A')} disagrees with (drive - VF - driver drop)/rLed = ${eng(ledCurrent, 'A')}; rLed is used.` })
  const drop = driverDropOf(stage)
  if (stage.rLed !== undefined && stage.driveVoltage <= stage.vf + drop)
    warnings.push({ code: 'unsaturated', message: `Drive voltage ${eng(stage.driveVoltage, 'V')} does not exceed the LED forward voltage ${eng(stage.vf, 'V')} plus the driver's own drop ${eng(drop, 'V')}: the LED never lights.` })
  const swingV = Math.max(0, vcc - vceSat)
  const icRequired = swingV / rl
  const diverted = rbeDivertedCurrent(stage.rbe, hfe, VBE_HIGH)
  const icAvailable = Math.max(0, stage.ctrMin * ctrDeratingOf(stage) * ledCurrent - diverted)
  // no swing (VCC <= VCE(sat)) cannot be driven at all: overdrive 0, not saturated
  const overdrive = icRequired > 0 ? icAvailable / icRequired : 0
  const saturated = icRequired > 0 && ledCurrent > 0 && icAvailable >= icRequired
  if (vcc <= vceSat) warnings.push({ code: 'other', message: `Output supply ${eng(vcc, 'V')} is not above VCE(sat) ${eng(vceSat, 'V')}: the output has no swing.` })
  if (!saturated)
    warnings.push({
      code: 'unsaturated',
      message: `Output does not saturate: derated CTR gives ${eng(icAvailable, 'A')}${diverted > 0 ? ` (after ${eng(diverted, 'A')} taken by RBE)` : ''} but (VCC - VCE(sat))/RL needs ${eng(icRequired, 'A')} (overdrive ${overdrive.toFixed(2)}). Raise the LED current or the pull-up resistance${diverted > 0 ? ', or RBE' : ''}.`,
    })
  if (stage.ctrTestCurrent !== undefined && ledCurrent > 0 && ledCurrent < 0.5 * stage.ctrTestCurrent)
    warnings.push({ code: 'other', message: `LED current ${eng(ledCurrent, 'A')} is well below the CTR test current ${eng(stage.ctrTestCurrent, 'A')}; CTR usually falls at low current, so the stated minimum may not hold.` })
  const power = ledCurrent * stage.vf + transistorPowerWorst(vcc, vceSat, rl, Math.min(icAvailable, icRequired), icRequired)
  absMax(warnings, ledCurrent, stage.ledCurrentMax, 'LED current', 'A')
  absMax(warnings, icRequired, stage.collectorCurrentMax, 'Collector current', 'A')
  absMax(warnings, power, stage.powerMax, 'Coupler power', 'W')
  const pinLimit = driverCurrentMaxOf(stage)
  if (pinLimit !== null && ledCurrent > pinLimit)
    warnings.push({
      code: 'absolute-maximum',
      message: `Driving pin current ${eng(ledCurrent, 'A')} exceeds its limit ${eng(pinLimit, 'A')}${stage.driverCurrentMax === undefined ? ' (the default for a logic pin)' : ''}: drive the LED through a transistor switch, or lower the LED current.`,
    })
  return { ledCurrent, icRequired, icAvailable, overdrive, saturated, power, diverted, swingV }
}

/**
 * The transistor's dissipation, worst case over the collector currents in service: the load
 * limits it to icRequired once saturated, a part at the derated minimum CTR gives icLow.
 */
function transistorPowerWorst(vcc: number, vceSat: number, rl: number, icLow: number, icRequired: number): number {
  let p = Math.max(transistorPower(icLow, vcc, vceSat, rl), transistorPower(icRequired, vcc, vceSat, rl))
  const icPeak = vcc / (2 * rl) // maximum of ic*(vcc - ic*rl)
  if (icPeak > icLow && icPeak < icRequired) p = Math.max(p, transistorPower(icPeak, vcc, vceSat, rl))
  return p
}

/**
 * Switching times (section 5, timing): the calibrated model at the stage's operating point
 * for every CTR hypothesis; the typical value, the fastest and the slowest, the slow delays
 * never faster than the model at the characterised range's nearest edge.
 */
function switchingTimes(stage: PhototransistorStage, ledCurrent: number, hfe: number) {
  const wiring = stage.wiring ?? 'collector'
  const loadCap = stage.loadCap ?? 0
  const calibrated = scenarios(stage, hfe)
  const central = calibrated[0]!
  const conditions = stage.characterization.map((p) => pointOperating(p, stage, central.ctrTyp, hfe))
  const box = { rl: spanOf(conditions.map((c) => c.rl)), ledCurrent: spanOf(conditions.map((c) => c.ledCurrent)), loadCap: spanOf(conditions.map((c) => c.loadCap)) }
  const here = (ctrTyp: number): CouplerOperatingPoint => ({
    rl: stage.rl,
    ledCurrent,
    loadCap,
    vcc: stage.vcc,
    vceSat: stage.vceSat ?? 0.4,
    ctrTyp,
    hfe,
    ...(stage.rbe !== undefined ? { rbe: stage.rbe } : {}),
  })
  const lit = ledCurrent > 0
  const predictions: CouplerSwitching[] = lit ? calibrated.map((sc) => predictSwitching(sc.calibration.params, here(sc.ctrTyp))) : []
  // the load adds to the output node's capacitance (physics, not a fitted trend): only a
  // load lighter than every point's can make the model faster than the range allows
  const outsideRange = outside(stage.rl, box.rl) || outside(ledCurrent, box.ledCurrent)
  const lighterLoad = loadCap < box.loadCap[0] * (1 - 1e-6)
  const edge =
    lit && (outsideRange || lighterLoad)
      ? predictSwitching(central.calibration.params, { ...here(central.ctrTyp), rl: clampTo(stage.rl, box.rl), ledCurrent: clampTo(ledCurrent, box.ledCurrent), loadCap: clampTo(loadCap, box.loadCap) })
      : null
  const typ = {} as Record<CharQuantity, number>
  const lo = {} as Record<CharQuantity, number>
  const hi = {} as Record<CharQuantity, number>
  for (const q of CHAR_QUANTITIES) {
    const mq = modelQuantity(wiring, q)
    const values = predictions.map((p) => p[mq])
    typ[q] = predictions[0] ? predictions[0][mq] : 0
    lo[q] = values.length ? Math.min(...values) : 0
    // the delays' slow corners are held at the edge; the transitions follow the model (a
    // transition held at another LED current would not belong to this edge's delay)
    const isDelay = q === 'tplh' || q === 'tphl'
    hi[q] = Math.max(values.length ? Math.max(...values) : 0, edge && isDelay ? edge[mq] : 0)
  }
  return { typ, lo, hi, central, conditions, box, outsideRange, lighterLoad, typPrediction: predictions[0], loadCap }
}

/** What the model had to assume or could not reproduce, in words. */
function modelWarnings(stage: PhototransistorStage, ledCurrent: number, t: ReturnType<typeof switchingTimes>, warnings: Warning[]) {
  const { central, box } = t
  if (ledCurrent > 0 && t.typPrediction && !t.typPrediction.switches)
    warnings.push({ code: 'unsaturated', message: `RBE ${eng(stage.rbe ?? 0, 'Ω')} diverts more current than the typical photocurrent supplies: the output never switches.` })
  if (stage.ctrTyp === undefined)
    warnings.push({
      code: 'other',
      message: `Typical CTR not given: assumed ${formatPercent(central.ctrTyp)} (${(central.ctrTyp / stage.ctrMin).toFixed(2)} x the minimum); the corners also cover ${CTR_TYP_BRACKET.map((m) => formatPercent(m * stage.ctrMin)).join(' and ')}. Enter the datasheet's typical CTR for tighter predictions.`,
    })
  if (stage.rbe !== undefined && stage.hfe === undefined) warnings.push({ code: 'other', message: `RBE is fitted but hfe is not given: the output transistor's gain is taken as ${DEFAULT_HFE}.` })
  if (t.outsideRange)
    warnings.push({
      code: 'extrapolation',
      message: `The operating point (RL ${eng(stage.rl, 'Ω')}, LED ${eng(ledCurrent, 'A')}) is outside the characterised range (RL ${eng(box.rl[0], 'Ω')} to ${eng(box.rl[1], 'Ω')}, LED ${eng(box.ledCurrent[0], 'A')} to ${eng(box.ledCurrent[1], 'A')}): the typical times follow the model; the slow corners are held at the range's nearest edge. Add a point taken near these conditions.`,
    })
  if (central.calibration.maxRelative > 0.15)
    warnings.push({
      code: 'extrapolation',
      message: `The model reproduces the characterisation points only within ${formatPercent(central.calibration.maxRelative)}: check the points (units, conditions); the corners are widened by that much.`,
    })
  const missing = CHAR_QUANTITIES.filter((q) => stage.characterization.every((p) => p[q] === undefined))
  if (missing.length)
    warnings.push({
      code: 'other',
      message: `${missing.map(label).join(', ')} ${missing.length === 1 ? 'is' : 'are'} not characterised: estimated from the model with the generic phototransistor class's parameters for what the points do not determine. Enter ${missing.length === 1 ? 'it' : 'them'} from the datasheet.`,
    })
  const assumedConditions = stage.characterization.filter((p) => p.ledCurrent === undefined || p.loadCap === undefined).length
  if (assumedConditions)
    warnings.push({
      code: 'other',
      message: `${assumedConditions} characterisation point${assumedConditions === 1 ? ' does' : 's do'} not state the LED current or load it was taken at: taken at ${eng(stage.ctrTestCurrent ?? POINT_DEFAULT_LED_CURRENT, 'A')} and ${eng(POINT_DEFAULT_LOAD_CAP, 'F')}.`,
    })
}

/**
 * The output swing: collector wiring VCE(sat)..VCC, emitter wiring 0..VCC - VCE(sat); an
 * unsaturated output only reaches what the derated current can pull across RL.
 */
function outputSwing(stage: PhototransistorStage, op: { saturated: boolean; icAvailable: number; swingV: number }): { vLow: number; vHigh: number } {
  const vceSat = stage.vceSat ?? 0.4
  let vLow: number
  let vHigh: number
  if ((stage.wiring ?? 'collector') === 'collector') {
    vHigh = stage.vcc
    vLow = op.saturated ? vceSat : Math.max(vceSat, stage.vcc - op.icAvailable * stage.rl)
  } else {
    vLow = 0
    vHigh = op.saturated ? op.swingV : Math.min(op.swingV, op.icAvailable * stage.rl)
  }
  return { vLow: stage.vLow ?? vLow, vHigh: stage.vHigh ?? vHigh }
}

/** The chain's edge model from the switching times: corners widened by what the fit misses, fast corners kept causal. */
function edgeModel(stage: PhototransistorStage, t: ReturnType<typeof switchingTimes>, swing: { vLow: number; vHigh: number }): StageEdgeModel {
  const wiring = stage.wiring ?? 'collector'
  const { typ, lo, hi } = t
  const passive = passiveDirection(wiring)
  const riseShape: EdgeShape = passive === 'rise' ? 'exponential' : 'ramp'
  const fallShape: EdgeShape = passive === 'fall' ? 'exponential' : 'ramp'
  // a fit that misses its own points widens the corners by what it misses
  const widen = 1 + t.central.calibration.maxRelative
  const tr = { typ: typ.tr, max: hi.tr * widen * (1 + TYPICAL_SPREAD) }
  const tf = { typ: typ.tf, max: hi.tf * widen * (1 + TYPICAL_SPREAD) }
  // a fast corner never puts the output's own edge before its cause: the delay is at least
  // the time the edge shape takes from its start to 50 % (ramp 0.625 t, exponential ln 2 / ln 9 t)
  const lead = (shape: EdgeShape, x: number) => (shape === 'ramp' ? 0.625 : Math.LN2 / Math.log(9)) * x
  const causal = (c: Corners, tt: { typ: number; max: number }, shape: EdgeShape): Corners => {
    const min = Math.min(c.typ, Math.max(c.min, lead(shape, tt.max)))
    // a bracketed transition longer than the typical delay allows is held to what it allows
    if (lead(shape, tt.max) > c.typ) tt.max = Math.max(tt.typ, c.typ / lead(shape, 1))
    return { ...c, min }
  }
  return {
    inverting: phototransistorInverts(wiring, stage.ledOnWhen ?? 'high'),
    tplh: causal(delayCorners(typ.tplh, lo.tplh, hi.tplh * widen, stage.partSkew), tr, riseShape),
    tphl: causal(delayCorners(typ.tphl, lo.tphl, hi.tphl * widen, stage.partSkew), tf, fallShape),
    tr,
    tf,
    riseShape,
    fallShape,
    vLow: swing.vLow,
    vHigh: swing.vHigh,
    partSkew: stage.partSkew ?? 0,
    jitterRms: stage.jitterRms ?? 0,
    jitterPeak: stage.jitterPeak ?? 0,
  }
}

/** The calibrated model as the stage form and the report show it. */
function couplerInfo(stage: PhototransistorStage, hfe: number, diverted: number, t: ReturnType<typeof switchingTimes>): CouplerModelInfo {
  const cal = t.central.calibration
  return {
    params: cal.params,
    fit: { values: cal.values, points: stage.characterization.length, rmsRelative: cal.rmsRelative, maxRelative: cal.maxRelative, residuals: cal.residuals },
    ctrTyp: t.central.ctrTyp,
    ctrTypAssumed: stage.ctrTyp === undefined,
    hfe,
    hfeAssumed: stage.hfe === undefined,
    storage: t.typPrediction?.storage ?? 0,
    tau: t.typPrediction?.tau ?? 0,
    typicalOverdrive: t.typPrediction?.overdrive ?? 0,
    rbeCurrent: diverted,
    range: t.box,
    outsideRange: t.outsideRange,
    pointConditions: stage.characterization.map((p, i) => ({
      rl: t.conditions[i]!.rl,
      ledCurrent: t.conditions[i]!.ledCurrent,
      loadCap: t.conditions[i]!.loadCap,
      vcc: t.conditions[i]!.vcc,
      rbe: p.rbe ?? null,
      assumed: [...(p.ledCurrent === undefined ? ['ledCurrent'] : []), ...(p.loadCap === undefined ? ['loadCap'] : []), ...(p.vcc === undefined ? ['vcc'] : [])],
    })),
  }
}

/**
 * The phototransistor stage reduced to the chain's edge model, with its warnings, static
 * operating point and calibrated model. `stage` is the validated schema object (defaults
 * may be missing: they are applied here as the schema states them).
 */
export function phototransistorModel(stage: PhototransistorStage): {
  model: StageEdgeModel
  warnings: Warning[]
  operating: PhototransistorOperating
  coupler: CouplerModelInfo
} {
  const warnings: Warning[] = []
  const hfe = stage.hfe ?? DEFAULT_HFE
  const op = staticOperatingPoint(stage, hfe, warnings)
  const t = switchingTimes(stage, op.ledCurrent, hfe)
  modelWarnings(stage, op.ledCurrent, t, warnings)
  const model = edgeModel(stage, t, outputSwing(stage, op))
  if (t.lighterLoad && !t.outsideRange)
    warnings.push({
      code: 'extrapolation',
      message: `The load ${eng(t.loadCap, 'F')} is lighter than every point's (${eng(t.box.loadCap[0], 'F')} and up): the slow corners are held at the lightest characterised load.`,
    })
  const { ledCurrent, icRequired, icAvailable, overdrive, saturated, power } = op
  return { model, warnings, operating: { ledCurrent, icRequired, icAvailable, overdrive, saturated, power }, coupler: couplerInfo(stage, hfe, op.diverted, t) }
}

function spanOf(values: number[]): [number, number] {
  return [Math.min(...values), Math.max(...values)]
}

function formatPercent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(3))} %`
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

/**
 * Delay corners around the typical value: -/+ partSkew/2 (never below 0), else
 * x (1 -/+ TYPICAL_SPREAD), widened to the lowest and highest hypothesis.
 */
function delayCorners(typ: number, lowest: number, highest: number, skew: number | undefined): Corners {
  return skew !== undefined
    ? { min: Math.max(0, lowest - skew / 2), typ, max: highest + skew / 2 }
    : { min: lowest * (1 - TYPICAL_SPREAD), typ, max: highest * (1 + TYPICAL_SPREAD) }
}

function label(q: CharQuantity): string {
  return q === 'tplh' ? 'tPLH' : q === 'tphl' ? 'tPHL' : q === 'tr' ? 'tr' : 'tf'
}
