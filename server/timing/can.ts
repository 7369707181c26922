/**
 * CAN bit timing across isolated transceivers (timing-model.md section 4, "CAN"): the
 * round-trip rule for the propagation segment, the oscillator tolerance of a setting, a
 * table of settings for a CAN clock and bit rate, and the longest bus a setting allows.
 *
 * The rule (CAN specification 2.0 part B; controller manuals' bit-timing chapters): in
 * arbitration a transmitter must see the farthest node's dominant bit before its own sample
 * point, so Prop_Seg >= 2 x (node output delay + bus line delay + node input delay) for the
 * two most distant nodes. Behind an isolator the output delay is isolator + transceiver
 * driver, the input delay transceiver receiver + isolator.
 */
import type { CanBitTiming, CanNodeDelays } from '../../shared/types/analysis'
import { EngineInputError } from './errors'

export type { CanBitTiming, CanNodeDelays }

/** Signal delay of a twisted pair, seconds per metre (about 5 ns/m, 0.66 c). */
export const BUS_DELAY_PER_METRE = 5e-9

/** Sync_Seg is 1 tq; Prop_Seg 1..8, Phase_Seg1 1..8, Phase_Seg2 2..8 (information processing time), SJW 1..4 (ISO 11898-1, classic CAN). */
const LIMITS = { prop: [1, 8], ps1: [1, 8], ps2: [2, 8], sjw: 4, tqPerBit: [8, 25] } as const

/** The node's loop delay: TXD through isolator and driver to the bus, and back through receiver and isolator to RXD. */
export function loopDelay(n: CanNodeDelays): number {
  return n.isolatorTx + n.driver + n.receiver + n.isolatorRx
}

/** One-way delay of `length` metres of bus. */
export function busDelay(length: number, perMetre = BUS_DELAY_PER_METRE): number {
  if (!(length >= 0)) throw new EngineInputError(['length'], 'the bus length must be zero or more metres')
  return length * perMetre
}

/**
 * The propagation time Prop_Seg must cover: twice the longest one-way delay between the two
 * farthest nodes a and b, either way (output of one, the bus, input of the other).
 */
export function propagationTime(a: CanNodeDelays, b: CanNodeDelays, length: number, perMetre = BUS_DELAY_PER_METRE): number {
  const out = (n: CanNodeDelays) => n.isolatorTx + n.driver
  const inp = (n: CanNodeDelays) => n.receiver + n.isolatorRx
  const bus = busDelay(length, perMetre)
  return 2 * Math.max(out(a) + bus + inp(b), out(b) + bus + inp(a))
}

/** Prop_Seg in time quanta for a propagation time: rounded up. */
export function propSegTq(propagation: number, tq: number): number {
  if (!(tq > 0)) throw new EngineInputError(['tq'], 'the time quantum must be positive')
  return Math.max(1, Math.ceil(propagation / tq - 1e-9))
}

/**
 * Oscillator tolerance df of a setting (CAN specification 2.0 part B, section 9): both
 * I  df <= min(Phase_Seg1, Phase_Seg2) / (2 (13 NBT - Phase_Seg2)), and
 * II df <= SJW / (20 NBT), NBT the bit time in tq.
 */
export function oscillatorTolerance(phaseSeg1: number, phaseSeg2: number, sjw: number, tqPerBit: number): { I: number; II: number; tolerance: number } {
  const I = Math.min(phaseSeg1, phaseSeg2) / (2 * (13 * tqPerBit - phaseSeg2))
  const II = sjw / (20 * tqPerBit)
  return { I, II, tolerance: Math.min(I, II) }
}

export interface CanTimingInput {
  /** the CAN controller's clock, hertz */
  clockHz: number
  /** nominal bit rate, bit/s */
  bitRate: number
  /** the two most distant nodes */
  nodes: [CanNodeDelays, CanNodeDelays]
  /** bus length between them, metres */
  length: number
  /** wanted sample point (CiA 301 recommends 87.5 %) */
  samplePoint?: number
  perMetre?: number
}

/**
 * Every setting of the CAN clock that gives the bit rate exactly with 8 to 25 tq per bit:
 * Prop_Seg as the round trip needs (or the most the bit leaves), the phase segments placing the
 * sample point nearest the wanted one, SJW as large as allowed; with its tolerance, whether the
 * loop delay fits, and the longest bus it would allow. Best first: the loop fits, then the sample point
 * nearest the wanted one, then the larger oscillator tolerance.
 */
export function canBitTimings(i: CanTimingInput): CanBitTiming[] {
  if (!(i.clockHz > 0)) throw new EngineInputError(['clockHz'], 'the CAN clock must be positive')
  if (!(i.bitRate > 0)) throw new EngineInputError(['bitRate'], 'the bit rate must be positive')
  const wanted = i.samplePoint ?? 0.875
  const propagation = propagationTime(i.nodes[0], i.nodes[1], i.length, i.perMetre)
  const fixed = propagation - 2 * busDelay(i.length, i.perMetre)
  const rows: CanBitTiming[] = []
  for (let tqPerBit = LIMITS.tqPerBit[0]; tqPerBit <= LIMITS.tqPerBit[1]; tqPerBit++) {
    const prescaler = i.clockHz / (i.bitRate * tqPerBit)
    if (Math.abs(prescaler - Math.round(prescaler)) > 1e-9 || Math.round(prescaler) < 1) continue
    const tq = Math.round(prescaler) / i.clockHz
    // the phase segments around the wanted sample point; Prop_Seg takes what the round trip needs
    let ps2 = Math.min(LIMITS.ps2[1], Math.max(LIMITS.ps2[0], Math.round(tqPerBit * (1 - wanted))))
    const needProp = propSegTq(propagation, tq)
    let prop = Math.min(LIMITS.prop[1], Math.max(LIMITS.prop[0], needProp))
    let ps1 = tqPerBit - 1 - prop - ps2
    // too little left for Phase_Seg1: take it from Prop_Seg (the loop then no longer fits)
    while (ps1 < LIMITS.ps1[0] && prop > LIMITS.prop[0]) {
      prop--
      ps1++
    }
    // too much: move the surplus into Prop_Seg (the sample point moves later) up to its limits
    while (ps1 > LIMITS.ps1[1] && prop < LIMITS.prop[1]) {
      prop++
      ps1--
    }
    while (ps1 > LIMITS.ps1[1] && ps2 < LIMITS.ps2[1]) {
      ps2++
      ps1--
    }
    if (ps1 < LIMITS.ps1[0] || ps1 > LIMITS.ps1[1]) continue
    const sjw = Math.min(LIMITS.sjw, ps1, ps2)
    const tol = oscillatorTolerance(ps1, ps2, sjw, tqPerBit)
    const perMetre = i.perMetre ?? BUS_DELAY_PER_METRE
    const length = (prop * tq) / 2 - fixed / 2
    rows.push({
      prescaler: Math.round(prescaler),
      tq,
      tqPerBit,
      propSeg: prop,
      phaseSeg1: ps1,
      phaseSeg2: ps2,
      sjw,
      samplePoint: (1 + prop + ps1) / tqPerBit,
      toleranceI: tol.I,
      toleranceII: tol.II,
      tolerance: tol.tolerance,
      loopFits: prop >= needProp,
      maxLength: length >= 0 ? length / perMetre : null,
    })
  }
  // sample points within half a percent of each other count as equally near the wanted one
  const off = (r: CanBitTiming) => Math.round(Math.abs(r.samplePoint - wanted) * 200)
  return rows.sort((a, b) => Number(b.loopFits) - Number(a.loopFits) || off(a) - off(b) || b.tolerance - a.tolerance || a.prescaler - b.prescaler)
}

/**
 * The longest bus at this bit rate: over every setting of the clock, Prop_Seg as long as the bit
 * allows with the phase segments at the wanted sample point (Phase_Seg1 at least 1 tq), the
 * length whose round trip it still covers. Null when no setting covers even the nodes' own delays.
 */
export function canMaxBusLength(i: Omit<CanTimingInput, 'length'>): number | null {
  const wanted = i.samplePoint ?? 0.875
  const perMetre = i.perMetre ?? BUS_DELAY_PER_METRE
  const fixed = propagationTime(i.nodes[0], i.nodes[1], 0, perMetre)
  let best: number | null = null
  for (let tqPerBit = LIMITS.tqPerBit[0]; tqPerBit <= LIMITS.tqPerBit[1]; tqPerBit++) {
    const prescaler = i.clockHz / (i.bitRate * tqPerBit)
    if (Math.abs(prescaler - Math.round(prescaler)) > 1e-9 || Math.round(prescaler) < 1) continue
    const tq = Math.round(prescaler) / i.clockHz
    const ps2 = Math.min(LIMITS.ps2[1], Math.max(LIMITS.ps2[0], Math.round(tqPerBit * (1 - wanted))))
    const prop = Math.min(LIMITS.prop[1], tqPerBit - 1 - ps2 - LIMITS.ps1[0])
    if (prop < LIMITS.prop[0]) continue
    const length = (prop * tq - fixed) / 2 / perMetre
    if (length >= 0 && (best === null || length > best)) best = length
  }
  return best
}

/**
 * Public contract (issue 15): the oscillator tolerance of a setting by the specification's two
 * conditions and their minimum, as fractions; `bitTq` is the bit time in time quanta.
 */
export function canOscillatorTolerance(s: { phaseSeg1: number; phaseSeg2: number; sjw: number; bitTq: number }): { cond1: number; cond2: number; tolerance: number } {
  for (const k of ['phaseSeg1', 'phaseSeg2', 'sjw', 'bitTq'] as const)
    if (!(Number.isInteger(s[k]) && s[k] >= 1)) throw new EngineInputError([k], `${k}: must be a whole number of time quanta, at least 1`)
  if (s.sjw > Math.min(s.phaseSeg1, s.phaseSeg2)) throw new EngineInputError(['sjw'], 'sjw: must not exceed either phase segment')
  if (1 + s.phaseSeg1 + s.phaseSeg2 >= s.bitTq) throw new EngineInputError(['bitTq'], 'bitTq: the bit must hold Sync_Seg, a Prop_Seg of at least 1 tq and both phase segments')
  const t = oscillatorTolerance(s.phaseSeg1, s.phaseSeg2, s.sjw, s.bitTq)
  return { cond1: t.I, cond2: t.II, tolerance: t.tolerance }
}

/**
 * Public contract (issue 15): the smallest Prop_Seg, in time quanta, covering twice the one-way
 * delay output -> bus -> input between the two most distant nodes (seconds in, tq out).
 */
export function canPropSegTq(s: { tq: number; nodeOutputDelay: number; busDelay: number; nodeInputDelay: number }): number {
  for (const k of ['nodeOutputDelay', 'busDelay', 'nodeInputDelay'] as const)
    if (!(s[k] >= 0)) throw new EngineInputError([k], `${k}: must be zero or more seconds`)
  return propSegTq(2 * (s.nodeOutputDelay + s.busDelay + s.nodeInputDelay), s.tq)
}
