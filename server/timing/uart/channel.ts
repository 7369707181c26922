/** One UART direction analysed: margins at the configured rate, maximum baud, clock tolerance, rate sweep, standard rates and the statistical view. (timing-model.md section 2; the method is described in ../uart.ts) */
import type { UartSettings } from '../../../shared/schemas/link'
import { formatEng } from '../../../shared/utils/units'
import { rateErrorBounds, statedErrorBounds, type ClockSpec, type RateErrorBounds } from '../clock'
import { gaussianTail, qFromBer, totalJitter } from '../statistics'
import type { Warning } from '../types'
import type { SamplerModel, Distortion, ClockErrors, UartBitResult, MaxBaudResult, StandardRateRow, BerEstimate, PulseCheck, UartChannelResult } from '../../../shared/types/analysis'
import { type FrameLayout, frameBits, frameLayout } from './frame'
import { type ReceiverEnd, type TransmitterEnd, samplerModel } from './sampler'
import { type CaseTable, bitMargins, caseTable, tableWorstUi, worstMarginUi } from './margins'
import { fixedClockCases, fixedClockWorstUi, maxBaud } from './max-baud'
import { clockTolerance } from './tolerance'

/** The usual UART rates, baud. */
export const STANDARD_BAUD_RATES = [
  1200, 2400, 4800, 9600, 14400, 19200, 28800, 38400, 57600, 76800, 115200, 230400, 250000, 460800, 500000, 921600, 1000000,
  1500000, 2000000, 3000000,
] as const

/** Highest baud the max-baud search reports: the schema's own limit. */
export const MAX_BAUD_CAP = 100e6

export interface UartChannelInput {
  channelId: string
  settings: Pick<UartSettings, 'baud' | 'dataBits' | 'parity' | 'stopBits' | 'backToBack' | 'requiredMarginUi' | 'berTarget'>
  tx: TransmitterEnd
  rx: ReceiverEnd
  /** chain distortion at the receiving pin, physical directions (pwdTyp / pwdSigma for the statistical view) */
  chain: { pwd: { min: number; max: number }; jitterPeak: number; jitterRms: number; pwdTyp?: number; pwdSigma?: number }
  /** the receiver inverts (logical edges are the opposite physical ones) */
  receiverInvert: boolean
  /** why the channel cannot carry data at all (inverted polarity, unreachable threshold, unsaturated output); absent or null when it can */
  notFunctional?: string | null
  /** the longest shortest-pulse any stage of the chain needs, seconds, with the stage's name */
  pulseLimit?: { seconds: number; stage: string } | null
  /** path of the settings in the link, for errors: ['uart'] */
  path?: (string | number)[]
  /** the rx / tx keys of this direction in the link, for error paths */
  rxKey?: 'rx' | 'tx'
  txKey?: 'rx' | 'tx'
}

const TX_DEFAULT_OVERSAMPLING = 16

/** Rate error bounds of both ends at `baud`. */
function clocksAt(input: UartChannelInput, baud: number): { tx: RateErrorBounds; rx: RateErrorBounds } {
  return {
    tx: rateErrorBounds(input.tx, baud, input.tx.oversampling ?? TX_DEFAULT_OVERSAMPLING),
    rx: rateErrorBounds(input.rx, baud, input.rx.oversampling),
  }
}

/** Why a generator cannot produce `baud`, or null when both can. */
function unreachableRate(clocks: { tx: RateErrorBounds; rx: RateErrorBounds }, baud: number): string | null {
  for (const [end, b] of [
    ['transmitter', clocks.tx],
    ['receiver', clocks.rx],
  ] as const)
    if (b.generator && !b.generator.reachable)
      return `the ${end}'s baud generator cannot produce ${formatEng(baud, 'Bd')}: it would need a divisor below 1 and runs at ${formatEng(b.generator.actualBaud, 'Bd')} (divisor 1) instead`
  return null
}

/**
 * A fractional divisor alternates the tick period between floor and ceil of the divisor,
 * so each sample lands up to one generator clock period off its even position: the
 * deciding samples widen by 1 / (N x divisor) receiver bits each way.
 */
function withFractionalSpread(s: SamplerModel, rx: RateErrorBounds): SamplerModel {
  const g = rx.generator
  if (s.kind !== 'ticks' || !g || !g.fractional || s.oversampling === null) return s
  const spread = 1 / (s.oversampling * g.divisor)
  return { ...s, early: s.early - spread, late: s.late + spread, fractionalSpread: spread }
}

/** The frame's shortest pulse against the chain's pulse limit at `baud` with the transmitter's fastest clock. */
function pulseCheckAt(input: UartChannelInput, d: Distortion, tx: RateErrorBounds, baud: number): PulseCheck | null {
  if (!input.pulseLimit) return null
  const shortest = 1 / (baud * (1 + tx.max)) - Math.max(Math.abs(d.pwd.min), Math.abs(d.pwd.max))
  return { stage: input.pulseLimit.stage, required: input.pulseLimit.seconds, shortest, pass: shortest >= input.pulseLimit.seconds }
}

/** Full UART analysis of one direction (timing-model.md section 2). */
/** Each end's stated error bound, rate-independent (the maximum-baud search and the rate sweep use it). */
export function statedClockErrors(tx: ClockSpec, rx: ClockSpec): ClockErrors {
  return { tx: statedErrorBounds(tx), rx: statedErrorBounds(rx) }
}

export function analyzeUartChannel(input: UartChannelInput): UartChannelResult {
  const set = input.settings
  const path = input.path ?? ['uart']
  const layout = frameLayout(set.dataBits, set.parity, set.stopBits, set.backToBack)
  const clocks = clocksAt(input, set.baud)
  const sampler = withFractionalSpread(samplerModel(input.rx, [...path, input.rxKey ?? 'rx']), clocks.rx)
  const pwd = input.receiverInvert ? { min: -input.chain.pwd.max, max: -input.chain.pwd.min } : { ...input.chain.pwd }
  const distortion: Distortion = { pwd, jitterPeak: input.chain.jitterPeak, jitterRms: input.chain.jitterRms }
  const errors: ClockErrors = { tx: clocks.tx, rx: clocks.rx }
  const T = 1 / set.baud
  const req = set.requiredMarginUi
  const warnings = generatorWarnings(input.channelId, clocks, set.baud)
  const functional = !input.notFunctional
  const pulseCheck = pulseCheckAt(input, distortion, clocks.tx, set.baud)
  const unreachable = unreachableRate(clocks, set.baud)
  const noMarginReason = !functional
    ? `the channel cannot carry data: ${input.notFunctional}`
    : unreachable
      ? unreachable
      : pulseCheck && !pulseCheck.pass
        ? `a bit of ${formatEng(pulseCheck.shortest, 's')} (after the chain's asymmetry) is shorter than the ${formatEng(pulseCheck.required, 's')} stage '${pulseCheck.stage}' passes: pulses are lost`
        : null
  if (unreachable) warnings.push({ code: 'generator-error', channel: input.channelId, message: `${capitalise(unreachable)}.` })
  if (pulseCheck && !pulseCheck.pass && functional && !unreachable)
    warnings.push({ code: 'no-pass', channel: input.channelId, message: `${capitalise(noMarginReason!)}.` })

  const bits = noMarginReason === null ? bitMargins(layout, sampler, distortion, errors, set.baud) : []
  let worstBit: number | null = bits.length ? 0 : null
  for (const b of bits) if (b.marginUi < bits[worstBit!]!.marginUi) worstBit = b.index
  const worstUi = worstBit === null ? null : bits[worstBit]!.marginUi
  const verdict: UartChannelResult['verdict'] = worstUi === null ? 'fail' : worstUi >= req ? 'pass' : worstUi >= 0 ? 'marginal' : 'fail'

  const search = functional ? maxBaudSearch(input, layout, sampler, distortion, req) : null
  if (search?.capped) warnings.push({ code: 'rate-cap', channel: input.channelId, message: search.note })
  if (search && search.maxBaud === null) warnings.push({ code: 'no-pass', channel: input.channelId, message: search.note })
  const table = caseTable(layout, sampler, distortion)
  const rateSweep = functional && search ? sweepRates(input, layout, sampler, table, search.maxBaud, search.cap) : []
  const standardRates = standardRateRows(input, table, distortion, functional)
  const fastest = standardRates.filter((r) => r.pass).pop()

  let statistical: UartChannelResult['statistical'] = null
  if (noMarginReason === null && input.chain.pwdTyp !== undefined && input.chain.pwdSigma !== undefined) {
    const lo = Math.max(input.chain.pwd.min, input.chain.pwdTyp - 3 * input.chain.pwdSigma)
    const hi = Math.min(input.chain.pwd.max, input.chain.pwdTyp + 3 * input.chain.pwdSigma)
    const phys = { min: Math.min(lo, hi), max: Math.max(lo, hi) }
    const spwd = input.receiverInvert ? { min: -phys.max, max: -phys.min } : phys
    statistical = { pwd: spwd, worstMarginUi: worstMarginUi(layout, sampler, { ...distortion, pwd: spwd }, errors, set.baud) }
  }

  return {
    channelId: input.channelId,
    baud: set.baud,
    bitTime: T,
    frame: { dataBits: set.dataBits, parity: set.parity, stopBits: set.stopBits, backToBack: set.backToBack, frameBits: layout.frameBits },
    sampler,
    clocks,
    distortion,
    requiredMarginUi: req,
    bits,
    worstMarginUi: worstUi,
    worstBit,
    verdict,
    functional,
    noMarginReason,
    maxBaud: search?.maxBaud ?? null,
    maxBaudCap: search?.cap ?? baudCap(input),
    maxBaudCapped: search?.capped ?? false,
    maxBaudLimitedBy: search?.limitedBy ?? null,
    maxBaudNote: search?.note ?? `No maximum rate: ${noMarginReason}.`,
    clockTolerance: functional ? clockTolerance(layout, sampler, distortion, set.baud, req) : { slowest: null, fastest: null, slowestBit: null, fastestBit: null },
    rateSweep,
    standardRates,
    fastestStandardRate: fastest ? fastest.baud : null,
    pulseCheck,
    berEstimate: estimateBer(bits, distortion, set.berTarget, T),
    statistical,
    warnings,
  }
}

function capitalise(t: string): string {
  return t.charAt(0).toUpperCase() + t.slice(1)
}

/** A quantisation error above 1 % is flagged (a common firmware rule of thumb). */
function generatorWarnings(channelId: string, clocks: { tx: RateErrorBounds; rx: RateErrorBounds }, baud: number): Warning[] {
  const out: Warning[] = []
  for (const [end, b] of [
    ['transmitter', clocks.tx],
    ['receiver', clocks.rx],
  ] as const)
    if (b.generator && b.generator.reachable && Math.abs(b.generator.error) > 0.01)
      out.push({
        code: 'generator-error',
        channel: channelId,
        message: `The ${end}'s baud generator gives ${formatEng(b.generator.actualBaud, 'Bd', { digits: 5 })} for ${formatEng(baud, 'Bd', { digits: 5 })} (divisor ${b.generator.divisor}, error ${(b.generator.error * 100).toFixed(2)} %).`,
      })
  return out
}

/** Highest rate the search reports: the schema's limit, and what each baud generator reaches with divisor 1. */
function baudCap(input: UartChannelInput): number {
  let cap = MAX_BAUD_CAP
  if (input.rx.clockHz !== undefined) cap = Math.min(cap, input.rx.clockHz / input.rx.oversampling)
  if (input.tx.clockHz !== undefined) cap = Math.min(cap, input.tx.clockHz / (input.tx.oversampling ?? TX_DEFAULT_OVERSAMPLING))
  return cap
}

/**
 * Maximum baud meeting the required margin with each end at its stated error bound (a
 * generator's oscillator tolerance; its quantisation depends on the rate and shows in the
 * standard-rates table), below the pulse limit of the chain's stages.
 */
function maxBaudSearch(input: UartChannelInput, layout: FrameLayout, s: SamplerModel, d: Distortion, req: number): MaxBaudResult {
  let cap = baudCap(input)
  const stated = statedClockErrors(input.tx, input.rx)
  let pulseNote = ''
  if (input.pulseLimit) {
    const pwdAbs = Math.max(Math.abs(d.pwd.min), Math.abs(d.pwd.max))
    const limit = 1 / ((input.pulseLimit.seconds + pwdAbs) * (1 + stated.tx.max))
    if (limit < cap) {
      cap = limit
      pulseNote = ` Stage '${input.pulseLimit.stage}' passes no pulse shorter than ${formatEng(input.pulseLimit.seconds, 's')}: no faster rate works.`
    }
  }
  const r = maxBaud(layout, s, d, stated, req, cap)
  return pulseNote && r.capped ? { ...r, capped: false, note: `Limited by the pulse width.${pulseNote}` } : r
}

/** Rate sweep for the plot: log-spaced around the configured and the maximum rate, clocks at their stated bounds. */
function sweepRates(input: UartChannelInput, layout: FrameLayout, s: SamplerModel, table: CaseTable, max: number | null, cap: number): { baud: number; marginUi: number }[] {
  const baud = input.settings.baud
  const stated = statedClockErrors(input.tx, input.rx)
  const top = Math.min(cap, Math.max(baud, max ?? baud) * 4)
  const bottom = Math.max(1, Math.min(baud, max ?? baud) / 10)
  const points = 64
  const rates = new Set<number>([Math.min(baud, cap)])
  if (max !== null) rates.add(max)
  for (let i = 0; i < points; i++) rates.add(bottom * (top / bottom) ** (i / (points - 1)))
  const fixed = fixedClockCases(layout, s, stated)
  return [...rates]
    .filter((b) => b <= cap)
    .sort((a, b) => a - b)
    .map((b) => ({ baud: b, marginUi: fixedClockWorstUi(fixed, table, b) }))
}

/** The usual rates, each with both generators recomputed at it. */
function standardRateRows(input: UartChannelInput, table: CaseTable, d: Distortion, functional: boolean): StandardRateRow[] {
  const req = input.settings.requiredMarginUi
  return STANDARD_BAUD_RATES.map((baud) => {
    const c = clocksAt(input, baud)
    const gen = c.rx.generator ?? c.tx.generator
    const unreachable = unreachableRate(c, baud)
    const pulse = pulseCheckAt(input, d, c.tx, baud)
    const note = !functional ? 'the channel cannot carry data' : unreachable ?? (pulse && !pulse.pass ? `pulse shorter than stage '${pulse.stage}' passes` : null)
    const m = note === null ? tableWorstUi(table, { tx: c.tx, rx: c.rx }, baud) : null
    return {
      baud,
      marginUi: m,
      pass: m !== null && m >= req,
      divisor: gen ? gen.divisor : null,
      error: gen ? gen.error : null,
      generators: { tx: c.tx.generator, rx: c.rx.generator },
      note,
    }
  })
}

/**
 * Statistical view: random jitter (rms, root-sum-square over stages) on each edge and
 * on the sync edge, so an edge moves against the sync edge with sigma sqrt(2) RJ. The
 * probability that it crosses a worst-case margin m (peak jitter already spent there)
 * is the Gaussian tail Q(m / sigma); the dual-Dirac total jitter at the BER target is
 * TJ = DJ + 2 Q(BER) RJ with DJ = 2 x peak jitter.
 */
export function estimateBer(bits: readonly UartBitResult[], d: Distortion, berTarget: number, T: number): BerEstimate {
  const sigma = Math.SQRT2 * d.jitterRms
  const tail = (m: number) => (sigma > 0 ? gaussianTail(m / sigma) : m < 0 ? 1 : 0)
  const rows = bits.map((b) => {
    const p = Math.min(1, tail(b.earlyMargin) + (b.lateMargin === null ? 0 : tail(b.lateMargin)))
    return { index: b.index, label: b.label, errorProbability: p }
  })
  let logOk = 0
  let worst = 0
  for (const r of rows) {
    worst = Math.max(worst, r.errorProbability)
    logOk += r.errorProbability >= 1 ? -Infinity : Math.log1p(-r.errorProbability)
  }
  const frame = logOk === -Infinity ? 1 : logOk === 0 ? 0 : -Math.expm1(logOk)
  const q = qFromBer(berTarget)
  const tj = totalJitter(2 * d.jitterPeak, d.jitterRms, berTarget)
  return {
    berTarget,
    q,
    rjRms: d.jitterRms,
    djPeakToPeak: 2 * d.jitterPeak,
    totalJitter: tj,
    totalJitterUi: tj / T,
    edgeSigma: sigma,
    bits: rows,
    worstBitErrorProbability: worst,
    frameErrorProbability: frame,
    meetsTarget: bits.length > 0 && worst <= berTarget,
  }
}
