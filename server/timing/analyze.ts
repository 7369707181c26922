/**
 * analyzeLink: the whole analysis of one link (timing-model.md sections 1, 2, 3 and 8):
 * every channel's chain, the UART per-bit margins of each direction or the SPI
 * slacks, one verdict, every assumption in words, every warning, the engine version
 * and the full input used, so a margin report can be recomputed.
 */
import { LinkSpec, type Link, type UartSettings, type LinkInput } from '../../shared/schemas/link'
import { analyzeChain, type ChainAnalysis } from './chain'
import { EngineInputError } from './errors'
import { phototransistorAssumptions, type CouplerModelInfo } from './phototransistor'
import { analyzeSpi, type SpiResult } from './spi'
import { analyzeI2cLink } from './i2cLink'
import { analyzeCanLink } from './canLink'
import { analyzeRs485Link } from './rs485'
import type { ChainResult, Corners, Warning } from './types'
import { uartTimeline } from './timeline'
import { analyzeUartChannel, type ReceiverEnd, type TransmitterEnd, type UartChannelResult } from './uart'
import { ENGINE_VERSION } from './version'
import type { Verdict, ChannelResult, UartResult, LinkAnalysis, I2cLinkResult, CanLinkResult, Rs485LinkResult } from '../../shared/types/analysis'
export type { Verdict, ChannelResult, UartResult, LinkAnalysis }





/** Validate and default a link, turning the schema's first issue into an EngineInputError. */
export function parseLink(input: LinkInput | Link | unknown): Link {
  const r = LinkSpec.safeParse(input)
  if (r.success) return r.data
  const issues = r.error.issues.map((i) => ({ path: i.path.map((p) => (typeof p === 'symbol' ? String(p) : p)), message: i.message }))
  const first = issues[0]!
  throw new EngineInputError(first.path, `${first.path.join('.') || 'link'}: ${first.message}`, issues)
}

const GENERAL_ASSUMPTIONS = [
  'All times are seconds, 50 % to 50 % as datasheets define propagation delay; tPLH applies when a stage\'s output goes low to high, tPHL when it goes high to low.',
  'The driving pin switches with an ideal edge; its 50 % crossing is the time reference of every delay.',
  "A stage's own input switches at 50 % of the previous stage's swing unless the stage gives input thresholds; a wire and the driven direction of an rc stage pass the edge on without re-switching.",
  'A plain CMOS input switches somewhere between VIL and VIH, one threshold per part for both edges; a Schmitt input at VT+ rising and VT- falling, independently within their ranges.',
  'Transition times vary between their typical and maximum values; a digital stage without tr / tf is taken as an ideal (0 s) edge.',
  "Stage delays vary independently between their min and max corners (worst case: interval sums); PWD max, where stated, bounds one part's |tPLH - tPHL|. The statistical spread treats min/max as ±3σ, root-sum-square over stages.",
  'Peak jitter adds over stages and random (rms) jitter adds as root-sum-square; every edge and the sync edge move independently.',
]

const UART_ASSUMPTIONS = [
  'The receiver re-times on the start bit\'s falling edge, detected at the first tick at or after it arrives (latency 0 to one tick); bit k is sampled at ticks k*N + s after the detection tick; majority voting is decided by the median sample, "all" by the first and last samples.',
  'Within one frame each edge direction has one fixed chain delay; only D_rise - D_fall and jitter move edges against the sync edge. Directions are logical, after the receiver\'s inversion.',
  'Every data value (all 2^n, with its parity) is considered; a boundary without a transition carries no risk; the receiver samples start, data, parity and the first stop bit only; back-to-back frames end the stop time at the next start edge, otherwise the idle line gives the last run no end (reported as null).',
  'A systematic asymmetry is never credited as a benefit: the PWD interval used for margins is widened to include zero.',
  'Each clock is anywhere within its error interval (the stated ± bound, or the generator\'s quantisation error with the oscillator tolerance on top; a generator without tolerancePpm takes errorPpm as its tolerance and a generator without fractionBits has an integer divisor). The maximum baud and the rate sweep hold the error fractions found at the configured rate; the standard-rates table recomputes each generator at each rate.',
  'The clock tolerance reports the incoming-rate range, relative to the receiver\'s own rate, that meets the required margin with the link\'s distortion and sampler, the configured clock errors set aside.',
  'The statistical view replaces the worst-case PWD interval by its nominal value ±3σ (root-sum-square over stages, each min/max taken as ±3σ), kept within the interval.',
  'The error-probability estimate applies the Gaussian tail of the random jitter (√2 times the edge rms, the sync edge moving too) beyond each worst-case margin; total jitter is dual-Dirac, TJ = DJ + 2 Q(BER) RJ with Q(BER) = Phi^-1(1 - BER) and DJ twice the peak jitter.',
  'A baud generator whose quantisation error exceeds 1 % is flagged (a common firmware rule of thumb).',
  'The maximum-baud search is exact (each margin in UI falls linearly with baud) up to a cap of the schema\'s 100 Mbaud limit or what each baud generator reaches with divisor 1.',
]

/** Analyse one link. Accepts the schema's input form (defaults optional) or an already parsed link. */
export function analyzeLink(input: LinkInput | Link): LinkAnalysis {
  return analyzeParsedLink(parseLink(input))
}

/**
 * The analysis of a link the schema has already read (a route's validated body, a stored
 * spec checked for completeness, a sweep's variant of a parsed link): the same analysis
 * without parsing the link a second time.
 */
export function analyzeParsedLink(link: Link): LinkAnalysis {
  const warnings: Warning[] = []
  const chains: ChainAnalysis[] = link.channels.map((ch, i) => analyzeChain(ch, { path: ['channels', i] }))
  const notFunctional = chains.map((c, i) => notFunctionalReason(c, link.channels[i]!))
  const functional = notFunctional.map((r) => r === null)
  for (const c of chains) warnings.push(...c.warnings)
  const assumptions = linkAssumptions(link)
  const channels = chains.map((c, i) => channelResult(c, functional[i]!))

  let uart: UartResult | null = null
  let spi: SpiResult | null = null
  let i2c: I2cLinkResult | null = null
  let can: CanLinkResult | null = null
  let rs485: Rs485LinkResult | null = null
  let verdict: Verdict = 'pass'
  if ((link.protocol === 'uart' || link.protocol === 'rs485') && link.uart) {
    uart = analyzeUart(link, chains, channels, notFunctional, assumptions)
    for (const r of uart.byChannel) warnings.push(...r.warnings)
    verdict = worseOf(uart.byChannel.map((r) => r.verdict))
  }
  if (link.protocol === 'spi' && link.spi) {
    spi = analyzeSpi(link, chains, notFunctional)
    warnings.push(...spi.warnings)
    assumptions.push(...spi.assumptions)
    verdict = spi.pass ? 'pass' : spi.worstSlack !== null && spi.worstSlack >= 0 ? 'marginal' : 'fail'
  }
  if (link.protocol === 'rs485' && link.rs485 && link.uart) {
    const r = analyzeRs485Link(link, chains)
    rs485 = r.result
    assumptions.push(...r.assumptions)
    if (!r.result.pass) verdict = 'fail'
  }
  if (link.protocol === 'i2c' && link.i2c) {
    const r = analyzeI2cLink(link, chains)
    i2c = r.result
    assumptions.push(...r.assumptions)
    verdict = r.result.pass ? (r.result.worstSlack < (link.i2c.requiredSlack ?? 0) ? 'marginal' : 'pass') : 'fail'
  }
  if (link.protocol === 'can' && link.can) {
    const r = analyzeCanLink(link, chains)
    can = r.result
    assumptions.push(...r.assumptions)
    verdict = r.result.pass ? 'pass' : 'fail'
  }
  if (functional.some((f) => !f)) verdict = 'fail'

  const result: LinkAnalysis = { engineVersion: ENGINE_VERSION, verdict, channels, uart, spi, i2c, can, rs485, assumptions, warnings: dedupeWarnings(warnings), input: link }
  assertFinite(result)
  return result
}

/** The assumptions every analysis of this link rests on: general, per stage kind, per stated part behaviour. */
function linkAssumptions(link: Link): string[] {
  const assumptions = [...GENERAL_ASSUMPTIONS]
  if (link.channels.some((ch) => ch.stages.some((s) => s.kind === 'phototransistor'))) assumptions.push(...phototransistorAssumptions())
  for (const ch of link.channels)
    for (const st of ch.stages)
      if (st.kind === 'digital' && st.failsafe)
        assumptions.push(`Stage '${st.name}' (${ch.id}): when its input side loses supply, its output goes ${st.failsafe} (the part's default output state); ${failsafeMeaning(ch.role, st.failsafe)}.`)
  const noEdge = link.channels.flatMap((ch) => ch.stages.filter((s) => s.kind === 'digital' && (!s.tr || !s.tf)).map((s) => `'${s.name}' (${ch.id})`))
  if (noEdge.length) assumptions.push(`Stages without a stated tr or tf, taken as ideal edges: ${noEdge.join(', ')}.`)
  return assumptions
}

/** What a stuck-high or stuck-low output means on a channel of this role. */
function failsafeMeaning(role: Link['channels'][number]['role'], level: 'high' | 'low'): string {
  if (role === 'txd') return level === 'high' ? 'the node sends recessive and stays off the bus' : 'the node holds the bus dominant (its transceiver\'s dominant time-out, if it has one, releases it)'
  if (role === 'rxd') return level === 'high' ? 'the controller reads a recessive bus' : 'the controller reads a dominant bus'
  if (role === 'de') return level === 'high' ? 'the driver stays enabled and holds the bus' : 'the driver stays off the bus'
  if (role === 'scl' || role === 'sda') return level === 'high' ? 'the line is released' : 'the line is held low (the bus hangs)'
  if (role === 'uart') return level === 'high' ? 'a UART line reads idle' : 'a UART line reads a break'
  return `the ${role.toUpperCase()} line sits ${level}`
}

/** A channel as the result reports it: the chain without its warnings, each stage as its corners. */
function channelResult(c: ChainAnalysis, functional: boolean): ChannelResult {
  return {
    id: c.id,
    role: c.role,
    rise: c.rise,
    fall: c.fall,
    pwd: c.pwd,
    pwdTyp: c.pwdTyp,
    pwdSigma: c.pwdSigma,
    polarity: c.polarity,
    tr: c.tr,
    tf: c.tf,
    riseShape: c.riseShape,
    fallShape: c.fallShape,
    jitterRms: c.jitterRms,
    jitterPeak: c.jitterPeak,
    partSkew: c.partSkew,
    receiverTerm: c.receiverTerm,
    functional,
    stages: c.stages.map((s) => ({
      index: s.index,
      name: s.name,
      kind: s.kind,
      inverting: s.inverting,
      tplh: s.model.tplh,
      tphl: s.model.tphl,
      tr: s.model.tr,
      tf: s.model.tf,
      asymmetry: s.asymmetry,
      sign: s.sign,
      ...(s.operating ? { operating: s.operating } : {}),
      ...(s.coupler ? { coupler: s.coupler } : {}),
    })),
  }
}

/** Every UART direction (the second uart channel runs the other way), each with its timeline; the worst one leads. */
function analyzeUart(link: Link, chains: ChainAnalysis[], channels: ChannelResult[], notFunctional: (string | null)[], assumptions: string[]): UartResult {
  const u = link.uart!
  assumptions.push(...UART_ASSUMPTIONS)
  const uartIdx = link.channels.map((c, i) => (c.role === 'uart' ? i : -1)).filter((i) => i >= 0)
  if (uartIdx.length > 1)
    assumptions.push(
      `The second uart channel ('${link.channels[uartIdx[1]!]!.id}') runs the other way: its transmitter is the end described by uart.rx and its receiver the end described by uart.tx, sampling with uart.rx's sampler, vote and sample point at uart.tx's oversampling (default ticks when that differs from uart.rx's).`,
    )
  const byChannel = uartIdx.map((ci, n) => {
    const ends = n === 0 ? firstDirection(u) : secondDirection(u)
    const ch = link.channels[ci]!
    const chain = chains[ci]!
    const r = analyzeUartChannel({
      channelId: ch.id,
      settings: u,
      tx: ends.tx,
      rx: ends.rx,
      txKey: ends.txKey,
      rxKey: ends.rxKey,
      chain: { pwd: chain.pwd, jitterPeak: chain.jitterPeak, jitterRms: chain.jitterRms, pwdTyp: chain.pwdTyp, pwdSigma: chain.pwdSigma },
      receiverInvert: ch.receiver.invert ?? false,
      notFunctional: notFunctional[ci],
      pulseLimit: pulseLimitOf(ch),
      path: ['uart'],
    })
    return { ...r, timeline: uartTimeline(r, channels[ci]!, ch.receiver.invert ?? false) }
  })
  // the worst direction: one without a margin first, else the smallest margin
  let worst = byChannel[0]!
  for (const r of byChannel) if (rank(r) < rank(worst)) worst = r
  return { ...worst, byChannel }
}

/** Why a channel cannot carry data at all, in words; null when it can. */
export function notFunctionalReason(c: ChainAnalysis, ch: Link['channels'][number]): string | null {
  const reasons: string[] = []
  if (!c.reachable) reasons.push('a threshold lies outside the swing that should cross it')
  if ((c.polarity === 'inverted') !== (ch.receiver.invert ?? false)) reasons.push('it ends with the wrong polarity')
  for (const s of c.stages)
    if (s.operating && !s.operating.saturated)
      reasons.push(s.operating.ledCurrent > 0 ? `the output of stage '${s.name}' does not saturate` : `the LED of stage '${s.name}' never lights`)
  return reasons.length ? reasons.join('; ') : null
}

/** The longest shortest-pulse the channel's digital stages need (minimum pulse width, glitch filter, maximum data rate). */
export function pulseLimitOf(ch: Link['channels'][number]): { seconds: number; stage: string } | null {
  let out: { seconds: number; stage: string } | null = null
  for (const s of ch.stages) {
    if (s.kind !== 'digital') continue
    const need = Math.max(s.minPulseWidth ?? 0, s.glitchFilter ?? 0, s.maxDataRate ? 1 / s.maxDataRate : 0)
    if (need > 0 && (!out || need > out.seconds)) out = { seconds: need, stage: s.name }
  }
  return out
}

/** Order of UART directions from worst: no margin, then the smallest margin. */
function rank(r: UartChannelResult): number {
  return r.worstMarginUi === null ? -Infinity : r.worstMarginUi
}

function worseOf(vs: Verdict[]): Verdict {
  return vs.includes('fail') ? 'fail' : vs.includes('marginal') ? 'marginal' : 'pass'
}

function dedupeWarnings(ws: Warning[]): Warning[] {
  const seen = new Set<string>()
  return ws.filter((w) => {
    const k = `${w.code}|${w.channel ?? ''}|${w.stage ?? ''}|${w.message}`
    if (seen.has(k)) return false
    seen.add(k)
    return true
  })
}

const clockOf = (c: { errorPpm?: number; clockHz?: number; fractionBits?: number; tolerancePpm?: number }) => ({
  ...(c.errorPpm !== undefined ? { errorPpm: c.errorPpm } : {}),
  ...(c.clockHz !== undefined ? { clockHz: c.clockHz } : {}),
  ...(c.fractionBits !== undefined ? { fractionBits: c.fractionBits } : {}),
  ...(c.tolerancePpm !== undefined ? { tolerancePpm: c.tolerancePpm } : {}),
})

type Ends = { tx: TransmitterEnd; rx: ReceiverEnd; txKey: 'tx' | 'rx'; rxKey: 'tx' | 'rx' }

/** The first uart channel: uart.tx transmits, uart.rx receives. */
function firstDirection(u: UartSettings): Ends {
  return {
    tx: { ...clockOf(u.tx), ...(u.tx.oversampling !== undefined ? { oversampling: u.tx.oversampling } : {}) },
    rx: {
      ...clockOf(u.rx),
      sampler: u.rx.sampler,
      oversampling: u.rx.oversampling,
      ...(u.rx.sampleTicks ? { sampleTicks: u.rx.sampleTicks } : {}),
      vote: u.rx.vote,
      samplePoint: u.rx.samplePoint,
    },
    txKey: 'tx',
    rxKey: 'rx',
  }
}

/** The second uart channel: the ends swap. */
function secondDirection(u: UartSettings): Ends {
  const n = u.tx.oversampling ?? u.rx.oversampling
  return {
    tx: { ...clockOf(u.rx), oversampling: u.rx.oversampling },
    rx: {
      ...clockOf(u.tx),
      sampler: u.rx.sampler,
      oversampling: n,
      ...(u.rx.sampleTicks && n === u.rx.oversampling ? { sampleTicks: u.rx.sampleTicks } : {}),
      vote: u.rx.vote,
      samplePoint: u.rx.samplePoint,
    },
    txKey: 'rx',
    rxKey: 'tx',
  }
}

/** The contract says no NaN or infinity anywhere: check the whole result (the input is already finite by the schema). */
function assertFinite(value: unknown): void {
  const bad = firstNonFinite(value)
  if (bad) throw new EngineInputError(bad, `the input leads to a non-finite result at ${bad.join('.')}; check the values feeding it`)
}

/** Path of the first non-finite number in a value, or null (the path is built only on the way out). */
function firstNonFinite(value: unknown): (string | number)[] | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : []
  if (value === null || typeof value !== 'object') return null
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const p = firstNonFinite(value[i])
      if (p) return [i, ...p]
    }
    return null
  }
  for (const k in value) {
    const p = firstNonFinite((value as Record<string, unknown>)[k])
    if (p) return [k, ...p]
  }
  return null
}
