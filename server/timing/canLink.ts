/**
 * An isolated CAN link (timing-model.md section 4, "CAN"): one node's txd channel (controller TXD
 * through its isolator and the transceiver's driver to the bus) and rxd channel (the bus through
 * the transceiver's receiver and the isolator back to RXD), the most distant other node, the bus
 * between them. The bit-timing table, the chosen setting's checks, the longest bus, and for CAN FD
 * the data phase: the transmitter's loop delay against its sample point (or its compensation) and
 * the bits the loop's edge asymmetry shortens.
 */
import type { Link } from '../../shared/schemas/link'
import type { BusCheck, BusTimeline, CanBitTiming, CanBitTimingRow, CanLinkResult, CanNodeDelays } from '../../shared/types/analysis'
import { busDelay, canBitTimings, canMaxBusLength, oscillatorTolerance, propagationTime } from './can'
import type { ChainAnalysis } from './chain'
import { EngineInputError } from './errors'

type Can = NonNullable<Link['can']>

/** Bit rates whose longest bus the result lists (CiA 301's table of recommended rates). */
const COMMON_RATES = [1e6, 800e3, 500e3, 250e3, 125e3, 50e3, 20e3, 10e3]

const withContractNames = (r: CanBitTiming): CanBitTimingRow => ({ ...r, brp: r.prescaler, loopDelayFits: r.loopFits })

/** The firmware's setting as a table row. */
function rowOf(s: Can, propagation: number, fixed: number): CanBitTimingRow {
  const t = s.timing!
  const tqPerBit = 1 + t.propSeg + t.phaseSeg1 + t.phaseSeg2
  const tq = t.brp / s.clockHz
  const tol = oscillatorTolerance(t.phaseSeg1, t.phaseSeg2, t.sjw, tqPerBit)
  const length = (t.propSeg * tq - fixed) / 2
  return withContractNames({
    prescaler: t.brp,
    tq,
    tqPerBit,
    propSeg: t.propSeg,
    phaseSeg1: t.phaseSeg1,
    phaseSeg2: t.phaseSeg2,
    sjw: t.sjw,
    samplePoint: (1 + t.propSeg + t.phaseSeg1) / tqPerBit,
    toleranceI: tol.I,
    toleranceII: tol.II,
    tolerance: tol.tolerance,
    loopFits: t.propSeg * tq >= propagation - 1e-15,
    maxLength: length >= 0 ? length / (s.delayPerMetre ?? 5e-9) : null,
  })
}

const worstDelay = (c: ChainAnalysis) => Math.max(c.rise.max, c.fall.max)

/** The analysis of a CAN link; throws EngineInputError (a 400) when no setting gives the bit rate. */
export function analyzeCanLink(link: Link, chains: ChainAnalysis[]): { result: CanLinkResult; assumptions: string[] } {
  const s = link.can!
  const txd = chains[link.channels.findIndex((c) => c.role === 'txd')]!
  const rxd = chains[link.channels.findIndex((c) => c.role === 'rxd')]!
  const out = worstDelay(txd)
  const inp = worstDelay(rxd)
  const far = s.farNode ?? { outputDelay: out, inputDelay: inp }
  const nodes: [CanNodeDelays, CanNodeDelays] = [
    { isolatorTx: out, driver: 0, receiver: inp, isolatorRx: 0 },
    { isolatorTx: far.outputDelay, driver: 0, receiver: far.inputDelay, isolatorRx: 0 },
  ]
  const perMetre = s.delayPerMetre ?? 5e-9
  const propagation = propagationTime(nodes[0], nodes[1], s.busLength, perMetre)
  const fixed = propagationTime(nodes[0], nodes[1], 0, perMetre)
  const table = canBitTimings({ clockHz: s.clockHz, bitRate: s.bitRate, nodes, length: s.busLength, samplePoint: s.samplePoint, perMetre }).map(withContractNames)
  if (!s.timing && table.length === 0)
    throw new EngineInputError(
      ['can', 'clockHz'],
      `can.clockHz: no setting of 8 to 25 time quanta per bit divides the ${s.clockHz} Hz clock into exactly ${s.bitRate} bit/s; choose a clock that is a whole multiple of the bit rate times the quanta per bit`,
    )
  const chosen = s.timing ? rowOf(s, propagation, fixed) : table[0]!
  const bitTime = 1 / s.bitRate
  const checks: BusCheck[] = []
  const min = (id: string, label: string, value: number, limit: number, unit?: BusCheck['unit']): BusCheck => ({ id, label, value, limit, kind: 'min', slack: value - limit, pass: value >= limit - 1e-15, ...(unit ? { unit } : {}) })
  const max = (id: string, label: string, value: number, limit: number, unit?: BusCheck['unit']): BusCheck => ({ id, label, value, limit, kind: 'max', slack: limit - value, pass: value <= limit + 1e-15, ...(unit ? { unit } : {}) })
  checks.push(min('loop-delay', 'Prop_Seg against twice the delay node -> bus -> farthest node', chosen.propSeg * chosen.tq, propagation))
  checks.push(max('sample-point', 'sample point inside the bit, after Sync_Seg and Prop_Seg', (1 + chosen.propSeg) * chosen.tq, chosen.samplePoint * bitTime))
  if (s.clockTolerance !== undefined)
    checks.push(min('oscillator-tolerance', "the setting's oscillator tolerance against the clocks' (both conditions of the CAN specification)", chosen.tolerance, s.clockTolerance, 'fraction'))
  let fd: CanLinkResult['fd'] = null
  const loop = out + inp
  if (s.fd) {
    const T = 1 / s.fd.dataBitRate
    const sp = s.fd.dataSamplePoint ?? 0.75
    // TXD recessive is high: a recessive bit starts with a rising edge; the loop's D_rise - D_fall delays it
    const pwd = { min: txd.pwd.min + rxd.pwd.min, max: txd.pwd.max + rxd.pwd.max }
    const recessiveShort = Math.max(0, pwd.max)
    const dominantShort = Math.max(0, -pwd.min)
    const tdc = s.fd.tdc ?? true
    checks.push(min('fd-recessive-bit', 'CAN FD data phase: recessive bit at RXD (shortened by the loop\'s edge asymmetry) against the part of the bit after the sample point', T - recessiveShort, (1 - sp) * T))
    checks.push(min('fd-dominant-bit', 'CAN FD data phase: dominant bit at RXD (shortened by the asymmetry) against the sample point', T - dominantShort, sp * T))
    if (!tdc) checks.push(max('fd-loop-delay', 'CAN FD data phase without delay compensation: the transmitter\'s own loop delay against its data sample point', loop, sp * T))
    fd = { dataBitRate: s.fd.dataBitRate, dataBitTime: T, dataSamplePoint: sp, recessiveShortening: recessiveShort, secondarySamplePoint: tdc ? loop + sp * T : null, tdc }
  }
  const maxBusLength = canMaxBusLength({ clockHz: s.clockHz, bitRate: s.bitRate, nodes, samplePoint: s.samplePoint, perMetre })
  const lengthByRate = COMMON_RATES.filter((r) => r <= 1e6).map((bitRate) => ({ bitRate, maxBusLength: canMaxBusLength({ clockHz: s.clockHz, bitRate, nodes, samplePoint: s.samplePoint, perMetre }) }))
  const seconds = checks.filter((c) => c.unit !== 'fraction')
  const worst = seconds.reduce((x, y) => (y.slack < x.slack ? y : x))
  const failed = checks.find((c) => !c.pass) ?? null
  const result: CanLinkResult = {
    bitRate: s.bitRate,
    clockHz: s.clockHz,
    node: { outputDelay: out, inputDelay: inp, loopDelay: loop },
    farNode: far,
    busDelay: busDelay(s.busLength, perMetre),
    propagation,
    bitTimings: table,
    chosen,
    chosenFrom: s.timing ? 'settings' : 'table',
    checks,
    maxBusLength,
    lengthByRate,
    fd,
    limiting: failed?.id ?? worst.id,
    worstSlack: worst.slack,
    pass: checks.every((c) => c.pass),
    timeline: canTimeline(s, chosen, { out, inp, far, bus: busDelay(s.busLength, perMetre) }, checks),
  }
  return { result, assumptions: canAssumptions(s) }
}

/** One nominal bit: TXD, the bus, this node's RXD and the farthest node's RXD, with the segments and the sample point. */
function canTimeline(s: Can, row: CanBitTimingRow, d: { out: number; inp: number; far: { outputDelay: number; inputDelay: number }; bus: number }, checks: BusCheck[]): BusTimeline {
  const T = 1 / s.bitRate
  const start = -0.1 * T
  const end = 1.5 * T
  // a dominant bit (low at TXD) from 0 to T, recessive around it
  const bit = (at: number): [number, number][] => [[start, 1], [at, 1], [at, 0], [at + T, 0], [at + T, 1], [end, 1]]
  const tq = row.tq
  const seg = (t0: number, n: number) => [t0 * tq, (t0 + n) * tq] as const
  const loop = checks.find((c) => c.id === 'loop-delay')!
  const [s0, s1] = seg(0, 1)
  const [p0, p1] = seg(1, row.propSeg)
  const [a0, a1] = seg(1 + row.propSeg, row.phaseSeg1)
  const [b0, b1] = seg(1 + row.propSeg + row.phaseSeg1, row.phaseSeg2)
  return {
    span: end - start,
    lanes: [
      { label: 'TXD, this controller', points: bit(0) },
      { label: 'bus at this node', points: bit(d.out) },
      { label: 'RXD at the farthest node', points: bit(d.out + d.bus + d.far.inputDelay) },
      { label: 'RXD, this controller (loop delay)', points: bit(d.out + d.inp) },
    ],
    windows: [
      { lane: 0, t0: s0, t1: s1, label: 'Sync', pass: null },
      { lane: 0, t0: p0, t1: p1, label: `Prop ${row.propSeg} tq`, pass: loop.pass },
      { lane: 0, t0: a0, t1: a1, label: `Phase 1 ${row.phaseSeg1} tq`, pass: null },
      { lane: 0, t0: b0, t1: b1, label: `Phase 2 ${row.phaseSeg2} tq`, pass: null },
      { lane: 2, t0: 0, t1: loop.limit, label: 'round trip to the farthest node and back', pass: loop.pass },
    ],
    marks: [{ t: row.samplePoint * T, label: `sample point ${(row.samplePoint * 100).toFixed(1)} %` }],
  }
}

function canAssumptions(s: Can): string[] {
  return [
    'CAN: the node\'s output delay is its txd channel (isolator and transceiver driver) and its input delay its rxd channel (transceiver receiver and isolator), each at its slowest edge; the farthest node is the same as this one unless stated.',
    `CAN: the bus delays ${((s.delayPerMetre ?? 5e-9) * 1e9).toFixed(1)} ns per metre; Prop_Seg must cover twice node output + bus + node input between the two farthest nodes (CAN specification 2.0 part B, bit timing).`,
    'CAN: classic bit timing with Sync_Seg 1 tq, Prop_Seg and Phase_Seg1 1-8 tq, Phase_Seg2 2-8 tq, SJW up to 4 tq, 8-25 tq per bit (ISO 11898-1); the oscillator tolerance is the smaller of the specification\'s two conditions.',
    ...(s.fd
      ? [
          'CAN FD: a recessive data bit is shortened by the loop\'s D_rise - D_fall (TXD recessive is high), a dominant one by D_fall - D_rise; the receiver, resynchronised on the edge before, must still read the bit at its sample point. Clock error in the data phase is not included.',
          s.fd.tdc ?? true
            ? "CAN FD: with transmitter delay compensation the transmitter checks its own bits at a secondary sample point, the loop delay after its data sample point; check that the controller's compensation range covers it."
            : 'CAN FD: without transmitter delay compensation the transmitter must see its own bit back before its data sample point.',
        ]
      : []),
  ]
}
