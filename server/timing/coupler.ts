/**
 * Charge-control model of a phototransistor coupler's output (timing-model.md section 5).
 *
 * The output transistor is slow for reasons that scale differently, and the model keeps
 * them apart (collector currents throughout: a base current i_B is carried as hFE x i_B):
 *
 * - LED and photodiode response: the photocurrent follows the LED current with a
 *   first-order lag `tauLed`; the typical collector current it can drive is
 *   I_av = CTR_typ x I_F, less I_x = hFE x VBE / R_BE diverted by a base-emitter resistor.
 * - Turn-on (LED lights; the collector output falls: tPHL, tf): the base first needs the
 *   charge `qOn` (junction capacitances up to VBE, in collector-current x time), then the
 *   collector falls as the drive current charges the Miller capacitance `cMiller`
 *   (= hFE x C_CB) plus the load capacitance through RL:
 *   tau dv/dt = -v + RL (I_av (1 - e^(-t/tauLed)) - I_x), tau = RL (cMiller (1 + 1/hFE) + C_L).
 *   Its speed is set by the LED current; RL barely matters (the drop is RL times a current
 *   that a time constant proportional to RL integrates).
 * - Turn-off (LED goes dark; the collector output rises: tPLH, tr): the excess base charge
 *   stored in saturation decays with the storage time constant `tauS` while the
 *   photocurrent tail fades (charge control, Q_x normalised to tauS x I_C / hFE):
 *   tauS dx/dt = OD e^(-t/tauLed) - (1 + r) - x, x(0) = OD - 1 - r, OD = I_av / I_C,
 *   r = I_x / I_C; the transistor leaves saturation when x = 0 (about tauS ln(OD) after
 *   the LED goes dark: the storage delay grows with overdrive and barely with RL). The
 *   output then rises through RL against the Miller capacitance plus the load, the same tau
 *   (proportional to RL), slowed by the photocurrent tail and sped up by R_BE, which
 *   cuts the transistor off once the Miller current no longer covers VBE / R_BE.
 *
 * Every quantity is computed in closed form with a bracketed root search (no time
 * stepping), so a 300-row pull-up sweep stays in milliseconds. The transistor-level
 * reference is `bench/coupler-spice.ts` (ngspice); `tests/unit/server/timing/coupler-spice.test.ts`
 * checks this model against it over a grid of RL, LED current, load and R_BE.
 */

import { VBE_HIGH, VBE_LOW } from '../../shared/utils/coupler'
import type { ChargeControlParams, SwitchingQuantity } from '../../shared/types/analysis'
export type { ChargeControlParams, SwitchingQuantity }


/** Where the coupler operates. */
export interface CouplerOperatingPoint {
  /** collector pull-up (load) resistance, ohms */
  rl: number
  /** LED forward current, amperes */
  ledCurrent: number
  /** load capacitance on the output node, farads */
  loadCap: number
  /** output supply, volts */
  vcc: number
  /** low level of the saturated output, volts */
  vceSat: number
  /** typical current transfer ratio, fraction */
  ctrTyp: number
  /** current gain of the output transistor */
  hfe: number
  /** base-emitter resistor, ohms (absent: open base) */
  rbe?: number
}

/** Predicted typical switching times and the quantities behind them. */
export interface CouplerSwitching {
  /** output low-to-high delay, LED current 50 % to output 50 %, seconds */
  tplh: number
  /** output high-to-low delay, seconds */
  tphl: number
  /** output 10-90 % rise time, seconds */
  tr: number
  /** output 90-10 % fall time, seconds */
  tf: number
  /** storage delay: LED dark to the transistor leaving saturation, seconds */
  storage: number
  /** RL x (Miller + load capacitance): the time constant of both output edges, seconds */
  tau: number
  /** typical overdrive (I_av - I_x) / I_C; below 1 the typical part does not saturate */
  overdrive: number
  /** collector current diverted by R_BE, hFE x VBE / R_BE, amperes */
  rbeCurrent: number
  /** false when the photocurrent never exceeds what R_BE diverts: the output never switches */
  switches: boolean
}

const EXP_LIMIT = 700

/**
 * The t >= lo where an increasing function f crosses 0: Newton's method from the guess x0,
 * safeguarded by the bracket it builds (a step that leaves the bracket bisects it, or
 * doubles the distance while no upper end is known), to a relative 1e-10 of t. `df` is
 * f's derivative.
 */
function rootIncreasing(f: (t: number) => number, df: (t: number) => number, lo: number, x0: number): number {
  let a = lo
  let b = Infinity
  let x = x0 > lo ? x0 : lo + Math.max(Math.abs(lo), 1e-12)
  for (let k = 0; k < 200; k++) {
    const fx = f(x)
    if (fx === 0) return x
    if (fx < 0) a = x
    else b = x
    const d = df(x)
    let next = d > 0 ? x - fx / d : NaN
    if (!(next > a && next < b)) next = b === Infinity ? a + 2 * (a - lo + 1e-12) : 0.5 * (a + b)
    if (Math.abs(next - x) <= 1e-10 * Math.abs(next) + 1e-30) return next
    x = next
  }
  return x
}

/** tau1 and tau2 kept apart so the two-exponential forms never divide by zero. */
function distinct(tau1: number, tau2: number): number {
  return Math.abs(tau1 - tau2) <= 1e-9 * Math.max(tau1, tau2) ? tau1 * (1 + 1e-6) : tau1
}

/** e^(-t/tau), 0 for tau = 0 and t > 0. */
function decay(t: number, tau: number): number {
  if (tau <= 0) return t > 0 ? 0 : 1
  const x = t / tau
  return x > EXP_LIMIT ? 0 : Math.exp(-x)
}

/** What both edges share at one operating point: currents, time constants, the reachable swing. */
interface EdgeTerms {
  p: ChargeControlParams
  op: CouplerOperatingPoint
  swing: number
  /** collector current of a saturated output, (VCC - VCE(sat)) / RL */
  ic: number
  /** typical available collector current, CTR_typ x I_F */
  iav: number
  /** collector current R_BE diverts at turn-on (VBE high) and at turn-off (VBE low) */
  ix: number
  ixOff: number
  /** output time constant RL (C_Miller (1 + 1/hFE) + C_load), and the LED lag kept apart from it */
  tau: number
  tauL: number
}

/**
 * Turn-on: a dead time while the base charge qOn arrives from the lagged photocurrent
 * (R_BE takes about half of VBE / R_BE while VBE rises; the collector cannot conduct before
 * the drive exceeds I_x), then the collector drop v(t) below VCC; 10 %, 50 % and 90 % of
 * the swing the typical part reaches.
 */
function turnOn(e: EdgeTerms): { f10: number; tphl: number; f90: number; reach: number } {
  const { p, op, iav, ix, tau, tauL } = e
  const tStart = ix > 0 ? -tauL * Math.log(1 - ix / iav) : 0
  const charge = (t: number) => iav * (t - tauL * (1 - decay(t, tauL))) - 0.5 * ix * t - p.qOn
  const dCharge = (t: number) => iav * (1 - decay(t, tauL)) - 0.5 * ix
  // guess: the lagged current's ramp (t << tauL), else its plateau
  const ramp = Math.sqrt((2 * tauL * p.qOn) / iav)
  const tDead = Math.max(tStart, p.qOn > 0 ? rootIncreasing(charge, dCharge, 0, ramp < tauL ? ramp : p.qOn / iav + tauL) : 0)
  // tau v' = -v + RL (a - b e^(-t/tauL)), v(tDead) = 0
  const a = op.rl * (iav - ix)
  const bK = (op.rl * iav * tauL) / (tauL - tau)
  const eD = decay(tDead, tauL)
  const drop = (t: number) => a * (1 - decay(t - tDead, tau)) - bK * (decay(t, tauL) - eD * decay(t - tDead, tau))
  const dDrop = (t: number) => {
    const es = decay(t - tDead, tau)
    return (a * es) / tau + bK * (decay(t, tauL) / tauL - (eD * es) / tau)
  }
  // the typical part may not reach the full swing: time its fractions of what it does reach
  const reach = Math.min(e.swing, a)
  const cross = (x: number, guess: number) => rootIncreasing((t) => drop(t) - x * reach, dDrop, tDead, guess)
  // the first guess: the drive as a step through tau and tauL in series
  const f10 = cross(0.1, tDead + (tau + tauL) * -Math.log(1 - (0.1 * reach) / a))
  const tphl = cross(0.5, f10 * 1.5)
  return { f10, tphl, f90: cross(0.9, tphl * 1.5), reach }
}

/**
 * Turn-off: the storage time until the base charge falls to what the load needs, then the
 * collector rise u(t) = VCC - v from the level reached; with R_BE the transistor cuts off
 * once the Miller current no longer covers I_x and the node then relaxes through RL alone.
 */
function turnOff(e: EdgeTerms, u0: number): { storage: number; r10: number; r50: number; r90: number } {
  const { p, op, iav, ic, ixOff, tau, tauL } = e
  const tauS = distinct(p.tauS, tauL)
  const level = (1 + ixOff / ic) / (iav / ic)
  let storage = 0
  if (level < 1) {
    // (tauS e^(-t/tauS) - tauL e^(-t/tauL)) / (tauS - tauL) falls from 1 to 0
    const q = (t: number) => level - (tauS * decay(t, tauS) - tauL * decay(t, tauL)) / (tauS - tauL)
    const dq = (t: number) => (decay(t, tauS) - decay(t, tauL)) / (tauS - tauL)
    storage = rootIncreasing(q, dq, 0, tauS * Math.log(1 / level) + Math.min(tauL, tauS))
  }
  const k0 = (op.rl * iav * decay(storage, tauL) * tauL) / (tauL - tau)
  const rx = op.rl * ixOff
  const uActive = (t: number) => (u0 - k0 + rx) * decay(t, tau) + k0 * decay(t, tauL) - rx
  let tCut = Infinity
  let uCut = 0
  const tauCut = op.rl * (p.cMiller / op.hfe + op.loadCap)
  if (ixOff > 0) {
    const collector = (t: number) => {
      const ip = iav * decay(storage + t, tauL)
      const slope = (uActive(t) - op.rl * (ip - ixOff)) / tau
      return -(ip - ixOff + p.cMiller * slope)
    }
    const dCollector = (t: number) => (collector(t * (1 + 1e-6) + 1e-15) - collector(t)) / (t * 1e-6 + 1e-15)
    tCut = collector(0) >= 0 ? 0 : rootIncreasing(collector, dCollector, 0, tau)
    uCut = uActive(tCut)
  }
  const u = (t: number) => (t <= tCut ? uActive(t) : uCut * decay(t - tCut, tauCut))
  // -u'(t): the rise's slope
  const du = (t: number) =>
    t <= tCut ? ((u0 - k0 + rx) * decay(t, tau)) / tau + (k0 * decay(t, tauL)) / tauL : tauCut > 0 ? (uCut * decay(t - tCut, tauCut)) / tauCut : 0
  const cross = (x: number, guess: number) => rootIncreasing((t) => x * u0 - u(t), du, 0, guess)
  const r10 = cross(0.9, tau * 0.105)
  const r50 = cross(0.5, Math.max(r10, tau * Math.LN2))
  return { storage, r10, r50, r90: cross(0.1, Math.max(r50, tau * Math.log(10))) }
}

/**
 * Typical switching times of the coupler output at one operating point, from calibrated
 * charge-control parameters. All inputs SI; the result is finite for any positive input.
 */
export function predictSwitching(p: ChargeControlParams, op: CouplerOperatingPoint): CouplerSwitching {
  const swing = Math.max(op.vcc - op.vceSat, 1e-6)
  const ic = swing / op.rl
  const iav = op.ctrTyp * op.ledCurrent
  // collector current R_BE diverts: the larger at turn-on, the smaller at turn-off
  const ix = op.rbe !== undefined ? (op.hfe * VBE_HIGH) / op.rbe : 0
  const ixOff = op.rbe !== undefined ? (op.hfe * VBE_LOW) / op.rbe : 0
  const tau = op.rl * (p.cMiller * (1 + 1 / op.hfe) + op.loadCap)
  const overdrive = (iav - ix) / ic
  const switches = iav > ix * (1 + 1e-9)
  if (!switches) return { tplh: 0, tphl: 0, tr: 0, tf: 0, storage: 0, tau, overdrive, rbeCurrent: ix, switches }
  const terms: EdgeTerms = { p, op, swing, ic, iav, ix, ixOff, tau, tauL: distinct(p.tauLed, tau) }
  const on = turnOn(terms)
  // the turn-off starts from the level the turn-on reached
  const off = turnOff(terms, on.reach)
  return { tplh: off.storage + off.r50, tphl: on.tphl, tr: off.r90 - off.r10, tf: on.f90 - on.f10, storage: off.storage, tau, overdrive, rbeCurrent: ix, switches }
}

/** One characterisation point in the model's terms (every condition resolved). */
export interface CalibrationPoint {
  op: CouplerOperatingPoint
  /** measured or datasheet values, seconds (absent: not characterised) */
  tplh?: number
  tphl?: number
  tr?: number
  tf?: number
}

export const SWITCHING_QUANTITIES: readonly SwitchingQuantity[] = ['tplh', 'tphl', 'tr', 'tf']

/** The calibration and how well it reproduces its points. */
export interface Calibration {
  params: ChargeControlParams
  /** number of measured values used */
  values: number
  /** root-mean-square of the relative residuals ln(model / measured) */
  rmsRelative: number
  /** largest |model / measured - 1| over the values */
  maxRelative: number
  /** per point and quantity: model / measured - 1 */
  residuals: Partial<Record<SwitchingQuantity, number>>[]
}

const PARAM_KEYS = ['tauS', 'cMiller', 'tauLed', 'qOn'] as const

function fromLog(v: readonly number[]): ChargeControlParams {
  return { tauS: Math.exp(v[0]!), cMiller: Math.exp(v[1]!), tauLed: Math.exp(v[2]!), qOn: Math.exp(v[3]!) }
}

/** A starting point read off the first point: tr gives RL x C, the rest of tPLH storage, tPHL the turn-on. */
function initialGuess(points: readonly CalibrationPoint[], prior: ChargeControlParams): number[] {
  const p = points[0]!
  const op = p.op
  let cMiller = prior.cMiller
  if (p.tr !== undefined) cMiller = Math.max(p.tr / (Math.log(9) * op.rl) - op.loadCap, 1e-15)
  const tau = op.rl * (cMiller + op.loadCap)
  let tauS = prior.tauS
  const od = (op.ctrTyp * op.ledCurrent) / ((op.vcc - op.vceSat) / op.rl)
  if (p.tplh !== undefined && od > 1.05) tauS = Math.max((p.tplh - Math.LN2 * tau) / Math.log(od), 1e-9)
  const tauLed = p.tf !== undefined ? Math.max(p.tf / 2, 1e-10) : prior.tauLed
  const qOn = p.tphl !== undefined ? Math.max(0.1 * op.ctrTyp * op.ledCurrent * p.tphl, 1e-15) : prior.qOn
  return [Math.log(tauS), Math.log(cMiller), Math.log(tauLed), Math.log(qOn)]
}

/**
 * Calibrate the model from characterisation points by least squares on the relative
 * errors (Levenberg-Marquardt over the logarithms of the parameters, so each stays
 * positive). With fewer measured values than parameters, the undetermined parameters
 * stay near `prior` (a weak pull of weight `priorWeight` toward it). `start` warm-starts
 * the search (a calibration of the same points under another typical CTR).
 */
export function calibrate(points: readonly CalibrationPoint[], prior: ChargeControlParams, start?: ChargeControlParams, priorWeight = 1e-3): Calibration {
  const logPrior = PARAM_KEYS.map((k) => Math.log(prior[k]))
  const meas: { i: number; q: SwitchingQuantity; v: number }[] = []
  points.forEach((p, i) => {
    for (const q of SWITCHING_QUANTITIES) {
      const v = p[q]
      if (v !== undefined && v > 0) meas.push({ i, q, v })
    }
  })
  const residualsOf = (x: number[]): number[] => {
    const params = fromLog(x)
    const preds = points.map((p) => predictSwitching(params, p.op))
    const out = meas.map((m) => {
      const pv = preds[m.i]![m.q]
      return pv > 0 ? Math.log(pv / m.v) : -50
    })
    for (let k = 0; k < 4; k++) out.push(priorWeight * (x[k]! - logPrior[k]!))
    return out
  }
  let x = start ? PARAM_KEYS.map((k) => Math.log(start[k])) : initialGuess(points, prior)
  let r = residualsOf(x)
  let cost = r.reduce((s, v) => s + v * v, 0)
  let lambda = 1e-3
  for (let iter = 0; iter < 200 && cost > 1e-24; iter++) {
    // numeric Jacobian (forward differences in log space)
    const J: number[][] = []
    for (let k = 0; k < 4; k++) {
      const h = 1e-6
      const xk = x.slice()
      xk[k]! += h
      const rk = residualsOf(xk)
      J.push(rk.map((v, j) => (v - r[j]!) / h))
    }
    // normal equations (J^T J + lambda diag) d = -J^T r
    const A = [0, 1, 2, 3].map((a) => [0, 1, 2, 3].map((b) => J[a]!.reduce((s, v, j) => s + v * J[b]![j]!, 0)))
    const g = [0, 1, 2, 3].map((a) => J[a]!.reduce((s, v, j) => s + v * r[j]!, 0))
    let improved = false
    for (let tries = 0; tries < 12; tries++) {
      const M = A.map((row, a) => row.map((v, b) => (a === b ? v * (1 + lambda) + 1e-18 : v)))
      const d = solve4(M, g.map((v) => -v))
      if (!d) {
        lambda *= 10
        continue
      }
      const xn = x.map((v, k) => v + Math.max(-3, Math.min(3, d[k]!)))
      const rn = residualsOf(xn)
      const cn = rn.reduce((s, v) => s + v * v, 0)
      if (cn < cost) {
        // converged: the cost stopped falling, or the step moves no parameter by 1e-7 (relative)
        const done = cost - cn < 1e-14 * Math.max(cost, 1e-30) || d.every((v) => Math.abs(v) < 1e-7)
        x = xn
        r = rn
        cost = cn
        lambda = Math.max(lambda / 10, 1e-12)
        improved = !done
        break
      }
      lambda *= 10
    }
    if (!improved) break
  }
  const params = fromLog(x)
  const preds = points.map((p) => predictSwitching(params, p.op))
  const residuals = points.map(() => ({}) as Partial<Record<SwitchingQuantity, number>>)
  let ss = 0
  let maxRelative = 0
  for (const m of meas) {
    const rel = preds[m.i]![m.q] / m.v - 1
    residuals[m.i]![m.q] = rel
    ss += Math.log(1 + rel) ** 2
    maxRelative = Math.max(maxRelative, Math.abs(rel))
  }
  return { params, values: meas.length, rmsRelative: meas.length ? Math.sqrt(ss / meas.length) : 0, maxRelative, residuals }
}

/** Solve a 4x4 linear system by Gaussian elimination with partial pivoting; null when singular. */
function solve4(M: number[][], b: number[]): number[] | null {
  const n = 4
  const a = M.map((row, i) => [...row, b[i]!])
  for (let c = 0; c < n; c++) {
    let piv = c
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[piv]![c]!)) piv = r
    if (!(Math.abs(a[piv]![c]!) > 1e-300)) return null
    ;[a[c], a[piv]] = [a[piv]!, a[c]!]
    for (let r = c + 1; r < n; r++) {
      const f = a[r]![c]! / a[c]![c]!
      for (let k = c; k <= n; k++) a[r]![k]! -= f * a[c]![k]!
    }
  }
  const x = new Array<number>(n).fill(0)
  for (let r = n - 1; r >= 0; r--) {
    let s = a[r]![n]!
    for (let k = r + 1; k < n; k++) s -= a[r]![k]! * x[k]!
    x[r] = s / a[r]![r]!
  }
  return x.every(Number.isFinite) ? x : null
}
