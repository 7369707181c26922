/**
 * An isolated I2C link (timing-model.md section 4, "I2C"; NXP UM10204): the controller's side a,
 * the target's side b, a bidirectional isolator between them whose SCL channel (a -> b) and SDA
 * channel (b -> a, taken as symmetric a -> b) are the link's 'scl' and 'sda' chains. Every check
 * is a time with its limit at the controller's SCL frequency; each is linear in the SCL period at
 * a fixed duty, so the highest SCL frequency follows exactly from two evaluations.
 *
 * Time 0 is the controller's SCL falling edge at its own pin. UM10204 measures tLOW and tSU;DAT to
 * the 30 % point of SCL's rise and tHIGH from its 70 % point; an open-drain line released at t
 * reaches a fraction x of VDD at t - ln(1 - x) Rp Cb.
 */
import type { Link } from '../../shared/schemas/link'
import type { BusCheck, BusTimeline, I2cLinkResult } from '../../shared/types/analysis'
import type { ChainAnalysis } from './chain'
import { EngineInputError } from './errors'
import { seriesValues, type SeriesName } from './eseries'
import { I2C_MODES, I2C_TVDDAT, i2cFallTime, i2cRiseTime, i2cRpMax, i2cSide, i2cVolMax } from './i2c'
import type { Corners } from './types'

/** Time for an RC line released from low to reach `fraction` of VDD. */
const riseTo = (fraction: number, rp: number, cb: number) => -Math.log(1 - fraction) * rp * cb

/** The delays of the isolator's channels, seconds (the chains at the receiving side). */
interface IsolatorDelays {
  sclRise: Corners
  sclFall: Corners
  sda: { min: number; typ: number; max: number }
}

/** Checks that do not scale with the SCL period and are spec limits rather than the team's slack. */
const SPEC_ONLY = new Set(['rise-controller', 'rise-target', 'fall-controller', 'fall-target', 'mode-frequency'])

type I2c = NonNullable<Link['i2c']>

/** Every timing check of the bus at period T (before the team's required slack). */
function timingChecks(s: I2c, iso: IsolatorDelays, T: number): BusCheck[] {
  const m = I2C_MODES[s.mode]
  const a = s.controller
  const b = s.target
  const d = s.dutyLow ?? m.tLow / (m.tLow + m.tHigh)
  const th = s.isolator?.threshold ?? 0.5
  const ra = (x: number) => riseTo(x, a.rp, a.cb)
  const rb = (x: number) => riseTo(x, b.rp, b.cb)
  const lowA = d * T
  // SCL at the target: falls after the isolator's falling delay; rises once side a has reached the isolator's threshold and the isolator has released side b
  const bRise30Early = lowA + ra(th) + iso.sclRise.min + rb(0.3)
  const bRise70Late = lowA + ra(th) + iso.sclRise.max + rb(0.7)
  const tVdDat = b.tVdDat ?? I2C_TVDDAT[s.mode]
  // read data or ACK: the target drives SDA within tVD;DAT of seeing SCL low; it crosses back and (rising, the slow case) reaches 70 % at the controller
  const roundTrip = iso.sclFall.max + tVdDat + iso.sda.max + ra(0.7)
  // write data: the controller's SDA valid within the mode's tVD;DAT at side a, across, 70 % at the target
  const writeValid = I2C_TVDDAT[s.mode] + iso.sda.max + rb(0.7)
  const min = (id: string, label: string, value: number, limit: number): BusCheck => ({ id, label, value, limit, kind: 'min', slack: value - limit, pass: true })
  const max = (id: string, label: string, value: number, limit: number): BusCheck => ({ id, label, value, limit, kind: 'max', slack: limit - value, pass: true })
  return [
    max('rise-controller', 'tr, controller side (30 %-70 %, 0.8473 Rp Cb)', ra(0.7) - ra(0.3), m.riseMax),
    max('rise-target', 'tr, target side (30 %-70 %, 0.8473 Rp Cb)', rb(0.7) - rb(0.3), m.riseMax),
    max('fall-controller', "tf, controller side (70 %-30 %, a driver sinking the mode's IOL against the pull-up)", i2cFallTime(a, m.iol), m.fallMax),
    max('fall-target', "tf, target side (70 %-30 %, a driver sinking the mode's IOL against the pull-up)", i2cFallTime(b, m.iol), m.fallMax),
    min('mode-frequency', "SCL period against the mode's fSCL(max)", T, 1 / m.fSclMax),
    min('low-controller', 'tLOW at the controller', lowA + ra(0.3), m.tLow),
    min('high-controller', 'tHIGH at the controller', T - lowA - ra(0.7), m.tHigh),
    min('low-target', 'tLOW as the target sees it', bRise30Early - iso.sclFall.max, m.tLow),
    min('high-target', 'tHIGH as the target sees it (shortened by the rise and the isolator)', T + iso.sclFall.min - bRise70Late, m.tHigh),
    max('sda-round-trip', 'read data / ACK: SCL low -> target tVD;DAT -> back, against tSU;DAT before the controller\'s SCL rise', roundTrip, lowA + ra(0.3) - m.tSuDat),
    max('setup-target', 'write data: tSU;DAT at the target before the SCL rise it sees', writeValid, bRise30Early - m.tSuDat),
    min('hold-target', 'write data: tHD;DAT at the target (SDA must not change before SCL has fallen there)', a.tHdDat + iso.sda.min - iso.sclFall.max, 0),
  ]
}

/** Checks at period T with the team's required slack applied. */
function checksAt(s: I2c, iso: IsolatorDelays, T: number): BusCheck[] {
  const req = s.requiredSlack ?? 0
  return timingChecks(s, iso, T).map((c) => ({ ...c, pass: c.slack >= (SPEC_ONLY.has(c.id) ? 0 : req) - 1e-15 }))
}

/**
 * The highest SCL frequency meeting every check at this duty. Each slack is a T + b in the
 * period; a check with a = 0 either always passes or never does.
 */
function maxScl(s: I2c, iso: IsolatorDelays): { hz: number | null; by: string | null } {
  const req = s.requiredSlack ?? 0
  const T1 = 1e-6
  const T2 = 2e-6
  const c1 = timingChecks(s, iso, T1)
  const c2 = timingChecks(s, iso, T2)
  let tMin = 0
  let by: string | null = null
  for (let k = 0; k < c1.length; k++) {
    const need = SPEC_ONLY.has(c1[k]!.id) ? 0 : req
    const a = (c2[k]!.slack - c1[k]!.slack) / (T2 - T1)
    const b0 = c1[k]!.slack - a * T1
    if (Math.abs(a) < 1e-9) {
      if (b0 < need - 1e-15) return { hz: null, by: c1[k]!.id }
      continue
    }
    // a > 0 for every period-dependent check here (longer periods only help)
    const t = (need - b0) / a
    if (t > tMin) {
      tMin = t
      by = c1[k]!.id
    }
  }
  return tMin > 0 ? { hz: 1 / tMin, by } : { hz: null, by }
}

/** The isolator's delays from the link's scl and sda chains. */
function isolatorDelays(link: Link, chains: ChainAnalysis[]): IsolatorDelays {
  const scl = chains[link.channels.findIndex((c) => c.role === 'scl')]!
  const sda = chains[link.channels.findIndex((c) => c.role === 'sda')]!
  return {
    sclRise: scl.rise,
    sclFall: scl.fall,
    sda: { min: Math.min(sda.rise.min, sda.fall.min), typ: Math.max(sda.rise.typ, sda.fall.typ), max: Math.max(sda.rise.max, sda.fall.max) },
  }
}

/** The analysis of an I2C link; throws EngineInputError (a 400) for a pull-up below Rp(min). */
export function analyzeI2cLink(link: Link, chains: ChainAnalysis[]): { result: I2cLinkResult; assumptions: string[] } {
  const s = link.i2c!
  const m = I2C_MODES[s.mode]
  const iso = isolatorDelays(link, chains)
  const sideInput = (k: 'controller' | 'target') => {
    const v = s[k]
    const off = s.isolator?.lowOffset
    return {
      vdd: v.vdd,
      rp: v.rp,
      cb: v.cb,
      ...(v.vol !== undefined ? { vol: v.vol } : {}),
      ...(v.vil !== undefined ? { vilMin: v.vil } : {}),
      ...(off !== undefined && (s.isolator?.offsetSide ?? 'controller') === k ? { isolatorLowOffset: off } : {}),
    }
  }
  const sides = { controller: i2cSide(sideInput('controller'), s.mode), target: i2cSide(sideInput('target'), s.mode) }
  for (const k of ['controller', 'target'] as const)
    if (s[k].rp < sides[k].rpMin * (1 - 1e-9))
      throw new EngineInputError(
        ['i2c', k, 'rp'],
        `i2c.${k}.rp: ${s[k].rp} ohm is below Rp(min) = (VDD - VOL) / IOL = ${sides[k].rpMin.toFixed(0)} ohm at the mode's ${(m.iol * 1e3).toFixed(0)} mA: the drivers cannot pull the line low enough`,
      )
  const T = 1 / s.sclHz
  const checks = checksAt(s, iso, T)
  const levelChecks: I2cLinkResult['levelChecks'] = []
  for (const k of ['controller', 'target'] as const) {
    const side = sides[k]
    levelChecks.push({ id: `rp-min-${k}`, side: k, label: 'Rp against Rp(min) = (VDD - VOL) / IOL', value: s[k].rp, limit: side.rpMin, unit: 'Ω', pass: s[k].rp >= side.rpMin })
    levelChecks.push({ id: `capacitance-${k}`, side: k, label: "Cb against the mode's maximum bus capacitance", value: s[k].cb, limit: m.cbMax, unit: 'F', pass: s[k].cb <= m.cbMax })
    if (side.offsetLow !== null) {
      const vil = s[k].vil ?? 0.3 * s[k].vdd
      levelChecks.push({ id: `offset-vil-${k}`, side: k, label: "the isolator's low level (its offset) against the lowest VIL on this side", value: side.offsetLow, limit: vil, unit: 'V', pass: side.offsetLow < vil })
    }
  }
  const top = maxScl(s, iso)
  const worst = checks.reduce((x, y) => (y.slack < x.slack ? y : x))
  const failed = checks.find((c) => !c.pass) ?? null
  const levelFail = levelChecks.find((c) => !c.pass) ?? null
  const result: I2cLinkResult = {
    mode: s.mode,
    sclHz: s.sclHz,
    dutyLow: s.dutyLow ?? m.tLow / (m.tLow + m.tHigh),
    checks,
    levelChecks,
    sides,
    scl: sclTimes(checks),
    roundTrip: checks.find((c) => c.id === 'sda-round-trip')!.value,
    maxSclHz: levelFail ? null : top.hz,
    maxSclLimitedBy: levelFail ? levelFail.id : top.by,
    limiting: failed?.id ?? levelFail?.id ?? worst.id,
    worstSlack: worst.slack,
    pass: checks.every((c) => c.pass) && levelChecks.every((c) => c.pass),
    pullupSweep: (['controller', 'target'] as const).map((k) => pullupSweep(s, iso, k, 'E24')),
    timeline: i2cTimeline(s, iso, checks),
  }
  return { result, assumptions: i2cAssumptions(s) }
}

function sclTimes(checks: BusCheck[]): I2cLinkResult['scl'] {
  const v = (id: string) => checks.find((c) => c.id === id)!.value
  return { lowController: v('low-controller'), highController: v('high-controller'), lowTarget: v('low-target'), highTarget: v('high-target') }
}

/** One side's pull-up over an E series from half Rp(min) to twice Rp(max): its rise and the highest SCL it allows. */
function pullupSweep(s: I2c, iso: IsolatorDelays, side: 'controller' | 'target', series: SeriesName): I2cLinkResult['pullupSweep'][number] {
  const m = I2C_MODES[s.mode]
  const v = s[side]
  const rpMin = (v.vdd - (v.vol ?? i2cVolMax(v.vdd))) / m.iol
  const rpMax = i2cRpMax(m.riseMax, v.cb)
  const lo = Math.max(1, Math.min(rpMin, rpMax) / 2)
  const hi = Math.max(rpMin, rpMax) * 2
  const rows = seriesValues(series, lo, hi).map((rp) => {
    const variant: I2c = { ...s, [side]: { ...v, rp } }
    const rise = i2cRiseTime(rp, v.cb)
    const fall = i2cFallTime({ ...v, rp }, m.iol)
    const rpOk = rp >= rpMin * (1 - 1e-9)
    return {
      rp,
      rise,
      rpOk,
      riseOk: rise <= m.riseMax,
      fall: Number.isFinite(fall) ? fall : null,
      fallOk: fall <= m.fallMax,
      maxSclHz: rpOk ? maxScl(variant, iso).hz : null,
      current: Math.abs(rp - v.rp) <= 1e-6 * v.rp,
    }
  })
  return { side, series, rows }
}

/** Sampled points of an open-drain rise released at t0 (fractions of VDD). */
function rcRise(t0: number, rp: number, cb: number, until: number): [number, number][] {
  const tau = rp * cb
  const pts: [number, number][] = []
  const n = 12
  const end = Math.min(until, t0 + 5 * tau)
  for (let k = 0; k <= n; k++) {
    const t = t0 + ((end - t0) * k) / n
    pts.push([t, 1 - Math.exp(-(t - t0) / tau)])
  }
  return pts
}

/** SCL and SDA on both sides over one SCL period at typical isolator delays, with the round trip and the setup windows. */
function i2cTimeline(s: I2c, iso: IsolatorDelays, checks: BusCheck[]): BusTimeline {
  const m = I2C_MODES[s.mode]
  const T = 1 / s.sclHz
  const d = s.dutyLow ?? m.tLow / (m.tLow + m.tHigh)
  const lowA = d * T
  const a = s.controller
  const b = s.target
  const th = s.isolator?.threshold ?? 0.5
  const span = T * 1.1
  const start = -0.05 * T
  const bFall = iso.sclFall.typ
  const bRelease = lowA + riseTo(th, a.rp, a.cb) + iso.sclRise.typ
  const tVdDat = b.tVdDat ?? I2C_TVDDAT[s.mode]
  // the target releases SDA (a 1 after an ACK's 0: the slow case) so that it reaches 70 % at tVD;DAT
  const sdaB = Math.max(bFall, bFall + tVdDat - riseTo(0.7, b.rp, b.cb))
  const sdaA = sdaB + riseTo(th, b.rp, b.cb) + iso.sda.typ
  const end = start + span
  const sclA: [number, number][] = [[start, 1], [0, 1], [0, 0], [lowA, 0], ...rcRise(lowA, a.rp, a.cb, T), [T, 1], [T, 0], [end, 0]]
  const sclB: [number, number][] = [[start, 1], [bFall, 1], [bFall, 0], [bRelease, 0], ...rcRise(bRelease, b.rp, b.cb, T + bFall), [T + bFall, 1], [T + bFall, 0], [end, 0]]
  const sdaBLane: [number, number][] = [[start, 0], [sdaB, 0], ...rcRise(sdaB, b.rp, b.cb, end), [end, 1]]
  const sdaALane: [number, number][] = [[start, 0], [sdaA, 0], ...rcRise(sdaA, a.rp, a.cb, end), [end, 1]]
  const rt = checks.find((c) => c.id === 'sda-round-trip')!
  const sample = lowA + riseTo(0.3, a.rp, a.cb)
  return {
    span,
    lanes: [
      { label: 'SCL, controller side', points: sclA },
      { label: 'SCL, target side', points: sclB },
      { label: 'SDA, target side', points: sdaBLane },
      { label: 'SDA, controller side', points: sdaALane },
    ],
    windows: [
      { lane: 3, t0: 0, t1: rt.value, label: 'round trip (worst case)', pass: rt.pass },
      { lane: 3, t0: sample - m.tSuDat, t1: sample, label: 'tSU;DAT', pass: rt.pass },
    ],
    marks: [{ t: sample, label: 'controller samples SDA (SCL at 30 %)' }],
  }
}

function i2cAssumptions(s: I2c): string[] {
  return [
    'I2C: side a is the controller\'s, side b the target\'s; the scl channel is the isolator\'s SCL path a -> b and the sda channel its SDA path, taken with the same delays in both directions; the sides\' pull-ups and bus capacitances give the open-drain rises (keep them out of the chains).',
    'I2C: the mode\'s limits are UM10204 Table 10 (fSCL, tLOW, tHIGH, tr, tSU;DAT, tVD;DAT, Cb, IOL); tLOW and tSU;DAT are measured to SCL\'s 30 % point, tHIGH from its 70 % point, rise 30 %-70 % = 0.8473 Rp Cb.',
    `I2C: the controller drives SCL low for ${((s.dutyLow ?? I2C_MODES[s.mode].tLow / (I2C_MODES[s.mode].tLow + I2C_MODES[s.mode].tHigh)) * 100).toFixed(1)} % of the period and counts its high time from its release (no clock stretching by the target).`,
    'I2C: a target releasing SDA (a rising edge, the slow one) is the worst case of the round trip; the isolator passes SCL\'s rise once side a reaches its threshold.',
    `I2C: the controller holds its data ${s.controller.tHdDat > 0 ? `${(s.controller.tHdDat * 1e9).toFixed(0)} ns` : '0 s (UM10204\'s minimum; enter the controller\'s own hold if it is longer)'} after its SCL falling edge.`,
    "I2C: a fall is the driver sinking the mode's IOL (3 mA, 20 mA in Fast-mode Plus) against the pull-up's current at mid-swing, a constant-current driver (the slow case); a driver that sinks more falls faster.",
  ]
}
