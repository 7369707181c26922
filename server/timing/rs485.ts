/**
 * RS-485 half duplex behind isolators (timing-model.md section 4, "RS-485"): the driver-enable
 * line is a channel of its own, and the turnaround is checked at the bus, after both paths'
 * delays: the driver must be on before the start bit's edge arrives (enable path at its slowest
 * plus the driver's enable time, against the data path at its fastest) and stay on until the end
 * of the last stop bit has passed (enable path at its fastest plus the driver's disable time,
 * against the data path at its slowest).
 */
import type { Link } from '../../shared/schemas/link'
import type { BusCheck, BusTimeline, Rs485LinkResult, Rs485TurnaroundInput, Rs485TurnaroundResult } from '../../shared/types/analysis'
import { analyzeChain, type ChainAnalysis } from './chain'
import { EngineInputError } from './errors'

export type { Rs485TurnaroundInput, Rs485TurnaroundResult }

export function rs485Turnaround(i: Rs485TurnaroundInput): Rs485TurnaroundResult {
  if (!(i.baud > 0)) throw new EngineInputError(['baud'], 'baud must be positive')
  if (!(i.frameBits > 0)) throw new EngineInputError(['frameBits'], 'a frame has at least one bit')
  if (i.dataPath.min > i.dataPath.max) throw new EngineInputError(['dataPath'], 'the data path\'s minimum delay is above its maximum')
  if (i.enablePath.min > i.enablePath.max) throw new EngineInputError(['enablePath'], 'the enable path\'s minimum delay is above its maximum')
  // time 0: the start bit's edge leaves TX; DE was asserted leadTime before
  const driverOn = -i.leadTime + i.enablePath.max + i.driverEnable
  const startAtBus = i.dataPath.min
  // the last stop bit ends at TX frameBits / baud after the start edge; DE is released lagTime after that
  const frameEnd = i.frameBits / i.baud
  const driverOff = frameEnd + i.lagTime + i.enablePath.min + i.driverDisable
  const stopEndAtBus = frameEnd + i.dataPath.max
  const leadSlack = startAtBus - driverOn
  const lagSlack = driverOff - stopEndAtBus
  return { leadSlack, lagSlack, pass: leadSlack >= 0 && lagSlack >= 0 }
}

type Rs485Link = Link & { rs485: NonNullable<Link['rs485']>; uart: NonNullable<Link['uart']> }

/** Bits from the start bit to the end of the last stop bit. */
const frameBitCount = (u: NonNullable<Link['uart']>) => 1 + u.dataBits + (u.parity === 'none' ? 0 : 1) + u.stopBits

/**
 * The turnaround of an RS-485 link (the data itself is the UART analysis): the data path to the bus
 * is the first uart channel up to and with its first transceiver, counting that transceiver's driver
 * only; the enable path is the de channel up to its transceiver, whose enable and disable times apply.
 */
export function analyzeRs485Link(link: Link, chains: ChainAnalysis[]): { result: Rs485LinkResult; assumptions: string[] } {
  const l = link as Rs485Link
  const duplex = l.rs485.duplex ?? 'half'
  const frameBits = frameBitCount(l.uart)
  const dataIdx = l.channels.findIndex((c) => c.role === 'uart')
  const dataCh = l.channels[dataIdx]!
  const cut = dataCh.stages.findIndex((s) => s.kind === 'transceiver')
  const toBus = analyzeChain({ ...dataCh, role: 'txd', stages: dataCh.stages.slice(0, cut + 1) }, { path: ['channels', dataIdx] })
  const dataPath = { min: Math.min(toBus.rise.min, toBus.fall.min), max: Math.max(toBus.rise.max, toBus.fall.max) }
  const assumptions = [
    'RS-485: each transceiver in a uart channel adds its driver and its receiver delay; its skew bounds the PWD of each.',
    duplex === 'half'
      ? 'RS-485 half duplex: the data reaches the bus through the first uart channel up to its transceiver\'s driver; DE reaches the transceiver through the de channel; the driver must be on before the start bit arrives (slowest enable path + enable time against the fastest data path) and stay on past the end of the last stop bit (fastest enable path + disable time against the slowest data path).'
      : 'RS-485 full duplex: each direction has its own pair and its driver stays on; there is no turnaround.',
  ]
  if (duplex === 'full' || !l.uart) {
    const result: Rs485LinkResult = { duplex, frameBits, dataPath, enablePath: null, driverEnable: 0, driverDisable: 0, checks: [], minLeadTime: null, minLagTime: null, limiting: null, worstSlack: 0, pass: true, timeline: null }
    return { result, assumptions }
  }
  const deIdx = l.channels.findIndex((c) => c.role === 'de')
  const deCh = l.channels[deIdx]!
  const deCut = deCh.stages.findIndex((s) => s.kind === 'transceiver')
  const tr = deCh.stages[deCut] as Extract<Link['channels'][number]['stages'][number], { kind: 'transceiver' }>
  const de = chains[deIdx]!
  const enablePath = { min: Math.min(de.rise.min, de.fall.min), max: Math.max(de.rise.max, de.fall.max) }
  const driverEnable = tr.enableTime!
  const driverDisable = tr.disableTime!
  const u = l.uart
  const t = rs485Turnaround({ baud: u.baud, frameBits, leadTime: l.rs485.leadTime ?? 0, lagTime: l.rs485.lagTime ?? 0, dataPath, enablePath, driverEnable, driverDisable })
  const lead = l.rs485.leadTime ?? 0
  const lag = l.rs485.lagTime ?? 0
  const checks: BusCheck[] = [
    { id: 'de-lead', label: 'driver on at the bus before the start bit arrives (DE lead + fastest data path against slowest enable path + enable time)', value: lead + dataPath.min, limit: enablePath.max + driverEnable, kind: 'min', slack: t.leadSlack, pass: t.leadSlack >= 0 },
    { id: 'de-lag', label: 'driver still on at the bus when the last stop bit ends (DE lag + fastest enable path + disable time against the slowest data path)', value: lag + enablePath.min + driverDisable, limit: dataPath.max, kind: 'min', slack: t.lagSlack, pass: t.lagSlack >= 0 },
  ]
  const worst = checks[0]!.slack <= checks[1]!.slack ? checks[0]! : checks[1]!
  const failed = checks.find((c) => !c.pass) ?? null
  const result: Rs485LinkResult = {
    duplex,
    frameBits,
    dataPath,
    enablePath,
    driverEnable,
    driverDisable,
    checks,
    minLeadTime: lead - t.leadSlack,
    minLagTime: lag - t.lagSlack,
    limiting: failed?.id ?? worst.id,
    worstSlack: worst.slack,
    pass: t.pass,
    timeline: rs485Timeline(u.baud, frameBits, lead, lag, dataPath, enablePath, driverEnable, driverDisable, checks),
  }
  return { result, assumptions }
}

/** TX's frame, DE, and the frame at the bus with the window the driver is on. */
function rs485Timeline(baud: number, frameBits: number, lead: number, lag: number, data: { min: number; max: number }, en: { min: number; max: number }, tEn: number, tDis: number, checks: BusCheck[]): BusTimeline {
  const bit = 1 / baud
  const frameEnd = frameBits * bit
  const start = -Math.max(lead, bit) - bit
  const end = frameEnd + Math.max(lag, 0) + 2 * bit + tDis
  // start bit low, then alternating data bits (a 0x55 pattern), stop bits high
  const frame = (at: number): [number, number][] => {
    const pts: [number, number][] = [[start, 1]]
    for (let k = 0; k < frameBits; k++) {
      const v = k === 0 ? 0 : k >= frameBits - 1 ? 1 : k % 2
      pts.push([at + k * bit, pts[pts.length - 1]![1]], [at + k * bit, v])
    }
    pts.push([end, 1])
    return pts
  }
  const driverOn = -lead + en.max + tEn
  const driverOff = frameEnd + lag + en.min + tDis
  const ok = checks.every((c) => c.pass)
  return {
    span: end - start,
    lanes: [
      { label: 'TX, controller', points: frame(0) },
      { label: 'DE, controller', points: [[start, 0], [-lead, 0], [-lead, 1], [frameEnd + lag, 1], [frameEnd + lag, 0], [end, 0]] },
      { label: 'bus (data at its slowest)', points: frame(data.max) },
    ],
    windows: [
      { lane: 2, t0: driverOn, t1: driverOff, label: 'driver on (worst case)', pass: ok },
    ],
    marks: [{ t: frameEnd, label: 'end of the stop bit at TX' }],
  }
}
