/**
 * SPI through isolation (timing-model.md section 3): slack per check, the maximum
 * SCLK and a table of candidate SCLK frequencies.
 *
 * Time frame: the controller's own, unisolated SCLK pin, 50 % duty, half period H.
 * The controller launches MOSI on its launch edge and samples MISO on its sampling
 * edge exactly at its own SCLK edges. The peripheral sees each SCLK edge after the
 * forward channel's delay for that edge's direction at its pin, samples MOSI and
 * launches MISO on the edges it sees; MISO returns through its channel.
 *
 * Every slack is linear in H with a non-negative slope (slack = k*H + c, k in {0,1,2}),
 * so the maximum SCLK has a closed form: H >= (requiredSlack - c)/k for every check.
 */
import type { Link, SpiSettings } from '../../shared/schemas/link'
import type { ChainResult, Corners, Warning } from './types'
import type { SpiCheckId, SpiCheck, SpiCandidate, SpiResult } from '../../shared/types/analysis'
export type { SpiCheckId, SpiCheck, SpiCandidate, SpiResult }


export const SPI_CHECK_IDS: readonly SpiCheckId[] = [
  'mosi-setup',
  'mosi-hold',
  'sclk-high',
  'sclk-low',
  'miso-setup',
  'miso-hold',
  'cs-lead',
  'cs-lag',
]

/** Highest SCLK reported when no check limits it, hertz (the schema's SCLK limit). */
export const SPI_SCLK_CAP = 1e9




type Dir = 'rise' | 'fall'
const flip = (d: Dir): Dir => (d === 'rise' ? 'fall' : 'rise')

/** A channel as the SPI checks need it: delay per controller-side edge direction. */
interface SpiPath {
  id: string
  chain: ChainResult
  physicallyInverted: boolean
  /** logic level at the receiver is inverted after the receiver's own invert */
  logicallyInverted: boolean
  receiverInverts: boolean
}

const DEFAULT_PRESCALERS = [2, 4, 8, 16, 32, 64, 128, 256]
/** 1-2-5 steps from 100 kHz to 100 MHz, used as candidates when no controller clock is given. */
const STANDARD_SCLK = [1e5, 2e5, 5e5, 1e6, 2e6, 5e6, 1e7, 2e7, 5e7, 1e8]

/** Delay of an edge that leaves the driver as `d`, seconds: the chain is indexed by the receiving pin's direction. */
function delayOf(p: SpiPath, d: Dir): Corners {
  const atPin = p.physicallyInverted ? flip(d) : d
  return atPin === 'rise' ? p.chain.rise : p.chain.fall
}

/** Receiving-pin direction of an edge that leaves the driver as `d`. */
function pinDir(p: SpiPath, d: Dir): Dir {
  return p.physicallyInverted ? flip(d) : d
}

/**
 * Interval of (delay of channel a's edge in pin direction da) - (delay of channel b's
 * edge in pin direction db). Independent corners always bound it; a shared skew bound
 * (package channel-to-channel skew, or part-to-part skew) tightens it around the
 * typical difference, with channel a's own PWD added when the directions differ.
 */
function delayDifference(a: ChainResult, da: Dir, b: ChainResult, db: Dir, skew: number | null): { min: number; max: number } {
  const A = da === 'rise' ? a.rise : a.fall
  const B = db === 'rise' ? b.rise : b.fall
  let lo = A.min - B.max
  let hi = A.max - B.min
  if (skew !== null) {
    const Asame = db === 'rise' ? a.rise : a.fall
    const typ = Asame.typ - B.typ
    // a's own asymmetry between its da edge and its db edge
    let pLo = 0
    let pHi = 0
    if (da !== db) {
      if (da === 'rise') {
        pLo = a.pwd.min
        pHi = a.pwd.max
      } else {
        pLo = -a.pwd.max
        pHi = -a.pwd.min
      }
    }
    const cLo = typ - skew + pLo
    const cHi = typ + skew + pHi
    const nLo = Math.max(lo, cLo)
    const nHi = Math.min(hi, cHi)
    if (nLo <= nHi) {
      lo = nLo
      hi = nHi
    }
  }
  return { min: lo, max: hi }
}

/** The skew bound between two channels: the package's channelSkew, else the part-to-part skew when both chains state one. */
function skewBetween(spi: SpiSettings, a: SpiPath, b: SpiPath): number | null {
  for (const pkg of spi.packages ?? []) {
    if (pkg.channels.includes(a.id) && pkg.channels.includes(b.id)) return pkg.channelSkew
  }
  if (a.chain.partSkew > 0 && b.chain.partSkew > 0) return Math.max(a.chain.partSkew, b.chain.partSkew)
  return null
}

/** A check's slack as a line in the half period H: slack = k*H + c. */
interface Line {
  k: number
  c: number
  description: string
}

/** The paths and edges every check reads. */
interface SpiContext {
  spi: SpiSettings
  sclk: SpiPath
  mosi: SpiPath
  miso: SpiPath
  cs: SpiPath | null
  /** SCLK edges at the controller: leading rises when CPOL = 0; CPHA picks the sampling edge */
  leading: Dir
  trailing: Dir
  sampleEdge: Dir
  launchEdge: Dir
}

const SPI_ASSUMPTIONS = [
  'SPI: the controller launches MOSI and samples MISO exactly on its own SCLK edges (no controller output delay), SCLK at 50 % duty.',
  'SPI: chip select is active low; lead runs from CS asserted to the first SCLK edge, lag from the last (trailing) SCLK edge to CS released.',
  "SPI: worst-case slacks subtract each edge's peak jitter; random (rms) jitter is not in them.",
]
const SKEW_ASSUMPTION =
  "SPI: channels in one isolator package differ by at most its channelSkew around their typical difference (plus the channel's own PWD for opposite edges); channels in different parts by the larger partSkew when both state one; otherwise their delay corners are independent."

/** The channel of a role as a path, with a warning when it arrives inverted; null when the link has none. */
function pathFor(link: Link, chains: ChainResult[], role: 'sclk' | 'mosi' | 'miso' | 'cs', warnings: Warning[]): SpiPath | null {
  const ch = link.channels.find((c) => c.role === role)
  if (!ch) return null
  const chain = chains.find((c) => c.id === ch.id)
  if (!chain) throw new Error(`spi: no chain result for channel '${ch.id}'`)
  const physicallyInverted = chain.polarity === 'inverted'
  const receiverInverts = ch.receiver.invert ?? false
  const logicallyInverted = physicallyInverted !== receiverInverts
  if (logicallyInverted)
    warnings.push({
      code: 'inverted-polarity',
      channel: ch.id,
      message: `${role.toUpperCase()} channel '${ch.id}' arrives inverted: the ${role === 'sclk' ? 'clock polarity (CPOL) at the peripheral is wrong' : role === 'cs' ? 'chip select is asserted at the wrong level' : 'data bits arrive inverted'}. Add a second inverting stage or set the receiver to invert.`,
    })
  return { id: ch.id, chain, physicallyInverted, logicallyInverted, receiverInverts }
}

/** mosi-setup and mosi-hold: MOSI launched at 0 against the SCLK edge the peripheral samples on, H later. */
function mosiChecks(x: SpiContext): Record<'mosi-setup' | 'mosi-hold', Line> {
  const sPin = pinDir(x.sclk, x.sampleEdge)
  const skew = skewBetween(x.spi, x.mosi, x.sclk)
  let diffMax = -Infinity
  let diffMin = Infinity
  for (const dm of ['rise', 'fall'] as const) {
    const d = delayDifference(x.mosi.chain, dm, x.sclk.chain, sPin, skew)
    diffMax = Math.max(diffMax, d.max)
    diffMin = Math.min(diffMin, d.min)
  }
  const j = x.mosi.chain.jitterPeak + x.sclk.chain.jitterPeak
  const per = x.spi.peripheral
  return {
    'mosi-setup': { k: 1, c: -diffMax - j - per.mosiSetup, description: 'MOSI valid before the sampling SCLK edge at the peripheral, less its setup time' },
    'mosi-hold': { k: 1, c: diffMin - j - per.mosiHold, description: 'MOSI held after the sampling SCLK edge at the peripheral, less its hold time' },
  }
}

/** sclk-high and sclk-low: SCLK's half periods at the peripheral pin, changed by the channel's PWD (high = H - (D_rise - D_fall)). */
function sclkWidthChecks(x: SpiContext): Record<'sclk-high' | 'sclk-low', Line> {
  const pw = x.sclk.chain.pwd
  const jS = x.sclk.chain.jitterPeak
  const physHigh = -pw.max - 2 * jS
  const physLow = pw.min - 2 * jS
  const high = x.sclk.receiverInverts ? physLow : physHigh
  const low = x.sclk.receiverInverts ? physHigh : physLow
  const per = x.spi.peripheral
  return {
    'sclk-high': { k: 1, c: high - per.sclkHighMin, description: 'SCLK high time at the peripheral (half period changed by PWD) less its minimum' },
    'sclk-low': { k: 1, c: low - per.sclkLowMin, description: 'SCLK low time at the peripheral (half period changed by PWD) less its minimum' },
  }
}

/** The MISO round trip: the SCLK launch edge forward, the peripheral's clock-to-output, MISO back. */
function misoRoundTrip(x: SpiContext): { min: number; max: number } {
  const sLaunch = delayOf(x.sclk, x.launchEdge)
  const back = { min: Math.min(x.miso.chain.rise.min, x.miso.chain.fall.min), max: Math.max(x.miso.chain.rise.max, x.miso.chain.fall.max) }
  const c2o = x.spi.peripheral.clockToOut
  return { min: sLaunch.min + c2o.min + back.min, max: sLaunch.max + c2o.max + back.max }
}

/** miso-setup and miso-hold: the round trip against the controller's (possibly delayed) sampling edge. */
function misoChecks(x: SpiContext, roundTrip: { min: number; max: number }): Record<'miso-setup' | 'miso-hold', Line> {
  const ctl = x.spi.controller
  const delayed = ctl.delayedSampling ?? false
  const j = x.sclk.chain.jitterPeak + x.miso.chain.jitterPeak
  return {
    'miso-setup': {
      k: delayed ? 2 : 1,
      c: -roundTrip.max - j - ctl.misoSetup,
      description: delayed
        ? "MISO round trip against the controller's delayed sampling edge (one half-cycle later), less its setup time"
        : "MISO round trip against the controller's sampling edge, less its setup time",
    },
    'miso-hold': {
      k: delayed ? 0 : 1,
      c: roundTrip.min - j - ctl.misoHold,
      description: "MISO held after the controller's sampling edge (next bit's round trip), less its hold time",
    },
  }
}

/** cs-lead and cs-lag: chip select against the first and the last SCLK edge at the peripheral. */
function csChecks(x: SpiContext): Record<'cs-lead' | 'cs-lag', Line> {
  const { spi, sclk, cs } = x
  const ctl = spi.controller
  const per = spi.peripheral
  const jS = sclk.chain.jitterPeak
  // without a stated lead / lag time the controller keeps half a period
  const leadK = ctl.csLeadTime === undefined ? 1 : 0
  const lagK = ctl.csLagTime === undefined ? 1 : 0
  let leadC: number
  let lagC: number
  if (cs) {
    const skew = skewBetween(spi, cs, sclk)
    const jC = cs.chain.jitterPeak
    // CS asserted (falls at the controller) vs the first, leading, SCLK edge
    const dLead = delayDifference(cs.chain, pinDir(cs, 'fall'), sclk.chain, pinDir(sclk, x.leading), skew)
    leadC = (ctl.csLeadTime ?? 0) - dLead.max - jC - jS - per.csLead
    // CS released (rises) vs the last, trailing, SCLK edge
    const dLag = delayDifference(cs.chain, pinDir(cs, 'rise'), sclk.chain, pinDir(sclk, x.trailing), skew)
    lagC = (ctl.csLagTime ?? 0) + dLag.min - jC - jS - per.csLag
  } else {
    leadC = (ctl.csLeadTime ?? 0) + delayOf(sclk, x.leading).min - jS - per.csLead
    lagC = (ctl.csLagTime ?? 0) - delayOf(sclk, x.trailing).max - jS - per.csLag
  }
  return {
    'cs-lead': { k: leadK, c: leadC, description: 'CS asserted before the first SCLK edge at the peripheral, less its lead time' },
    'cs-lag': { k: lagK, c: lagC, description: 'CS released after the last SCLK edge at the peripheral, less its lag time' },
  }
}

/**
 * pulse-width: the shortest pulse a stage passes (digital isolators) against an SCLK half
 * period less its PWD, or a data bit (a whole period) less its PWD; the tightest channel
 * sets the check. Null when no stage states a limit.
 */
function pulseWidthCheck(link: Link, x: SpiContext): Line | null {
  let pulse: { k: number; c: number; what: string } | null = null
  const paths: [SpiPath, number][] = [[x.sclk, 1], [x.mosi, 2], [x.miso, 2], ...(x.cs ? ([[x.cs, 2]] as [SpiPath, number][]) : [])]
  for (const [path, k] of paths) {
    const ch = link.channels.find((c) => c.id === path.id)!
    const need = Math.max(0, ...ch.stages.map((st) => (st.kind === 'digital' ? Math.max(st.minPulseWidth ?? 0, st.glitchFilter ?? 0, st.maxDataRate ? 1 / st.maxDataRate : 0) : 0)))
    if (need <= 0) continue
    const c = -Math.max(Math.abs(path.chain.pwd.min), Math.abs(path.chain.pwd.max)) - need
    // compare at the largest half period where the check binds first: the smaller k*H + c
    if (!pulse || c / k < pulse.c / pulse.k) pulse = { k, c, what: `'${path.id}' pulses against its stages' ${need * 1e9 >= 1 ? `${Number((need * 1e9).toPrecision(3))} ns` : `${need} s`} minimum` }
  }
  return pulse && { k: pulse.k, c: pulse.c, description: `Shortest pulse through the isolators (${pulse.what}), after the channel's PWD` }
}

/** Every check at an SCLK, each against what it must keep: the fixed slack and, for checks that scale with the clock, a fraction of H. */
function spiEvaluator(lines: Map<SpiCheckId, Line>, required: number, fraction: number) {
  const requiredAt = (k: number, H: number) => Math.max(required, k > 0 ? fraction * H : 0)
  const evaluate = (sclkHz: number): SpiCheck[] => {
    const H = 1 / (2 * sclkHz)
    return [...lines].map(([id, { k, c, description }]) => {
      const slack = k * H + c
      const need = requiredAt(k, H)
      return { id, slack, slackFraction: slack / H, required: need, pass: slack >= need, slope: k, offset: c, description }
    })
  }
  const worstOf = (checks: SpiCheck[]) => checks.reduce((w, c) => (c.slack - c.required < w.slack - w.required ? c : w), checks[0]!)
  return { evaluate, worstOf }
}

/** The highest SCLK meeting every check, closed form (H >= (required - c)/k per check), with the check that sets it. */
function maxSclk(lines: Map<SpiCheckId, Line>, required: number, fraction: number, warnings: Warning[]): { maxSclkHz: number | null; limitingCheck: SpiCheckId | null } {
  let hMin = 0
  let limitingCheck: SpiCheckId | null = null
  for (const [id, { k, c }] of lines) {
    if (k === 0) {
      if (c < required) {
        warnings.push({ code: 'no-pass', message: `No SCLK passes: ${id} does not depend on SCLK and misses the required slack.` })
        return { maxSclkHz: null, limitingCheck: id }
      }
      continue
    }
    // k H + c >= requiredSlack and k H + c >= fraction H (fraction < 1 <= k)
    const h = Math.max((required - c) / k, fraction > 0 ? -c / (k - fraction) : -Infinity)
    if (h > hMin) {
      hMin = h
      limitingCheck = id
    }
  }
  if (hMin <= 1 / (2 * SPI_SCLK_CAP)) {
    warnings.push({ code: 'rate-cap', message: `No check limits SCLK up to ${SPI_SCLK_CAP / 1e6} MHz; the cap is reported.` })
    return { maxSclkHz: SPI_SCLK_CAP, limitingCheck: null }
  }
  return { maxSclkHz: 1 / (2 * hMin), limitingCheck }
}

/** Candidate SCLK frequencies: prescaler steps of the controller clock, else a 1-2-5 list; and the fastest that passes. */
function spiCandidates(spi: SpiSettings, ev: ReturnType<typeof spiEvaluator>): { candidates: SpiCandidate[]; fastestPassing: number | null } {
  const ctl = spi.controller
  const candidate = (f: number, prescaler: number | null): SpiCandidate => {
    const checks = ev.evaluate(f)
    const w = ev.worstOf(checks)
    return { sclkHz: f, prescaler, worstSlack: w.slack, worstCheck: w.id, pass: checks.every((c) => c.pass) }
  }
  const candidates =
    ctl.clockHz !== undefined
      ? [...new Set(ctl.prescalers ?? DEFAULT_PRESCALERS)].sort((a, b) => a - b).map((p) => candidate(ctl.clockHz! / p, p))
      : STANDARD_SCLK.map((f) => candidate(f, null))
  let fastestPassing: number | null = null
  candidates.forEach((c, i) => {
    if (c.pass && (fastestPassing === null || c.sclkHz > candidates[fastestPassing]!.sclkHz)) fastestPassing = i
  })
  return { candidates, fastestPassing }
}

/**
 * Slack of every SPI check, the maximum SCLK and the candidate table for an SPI link,
 * given the chain result of each of its channels (matched by channel id).
 */
export function analyzeSpi(link: Link, chains: ChainResult[], notFunctional: (string | null)[] = []): SpiResult {
  const spi = link.spi
  if (!spi) throw new Error('spi: an SPI link needs spi settings')
  const warnings: Warning[] = []
  const assumptions = [
    ...SPI_ASSUMPTIONS,
    ...(spi.requiredSlackFraction ? [`SPI: each check that scales with the clock keeps at least ${Math.round(spi.requiredSlackFraction * 100)} % of the half period as slack (and every check at least the fixed required slack).`] : []),
    SKEW_ASSUMPTION,
  ]
  const [sclk, mosi, miso, cs] = (['sclk', 'mosi', 'miso', 'cs'] as const).map((role) => pathFor(link, chains, role, warnings))
  if (!sclk || !mosi || !miso) throw new Error('spi: an SPI link needs sclk, mosi and miso channels')
  if (!cs) assumptions.push('SPI: there is no cs channel, so chip select is taken as not isolated (zero delay).')
  const leading: Dir = spi.cpol === 0 ? 'rise' : 'fall'
  const trailing = flip(leading)
  const x: SpiContext = { spi, sclk, mosi, miso, cs: cs ?? null, leading, trailing, sampleEdge: spi.cpha === 0 ? leading : trailing, launchEdge: spi.cpha === 0 ? trailing : leading }

  const roundTrip = misoRoundTrip(x)
  const lines = new Map<SpiCheckId, Line>(Object.entries({ ...mosiChecks(x), ...sclkWidthChecks(x), ...misoChecks(x, roundTrip), ...csChecks(x) }) as [SpiCheckId, Line][])
  const ordered = new Map<SpiCheckId, Line>(SPI_CHECK_IDS.map((id) => [id, lines.get(id)!]))
  const pulse = pulseWidthCheck(link, x)
  if (pulse) ordered.set('pulse-width', pulse)

  const required = spi.requiredSlack ?? 0
  const fraction = spi.requiredSlackFraction ?? 0
  const ev = spiEvaluator(ordered, required, fraction)
  const { maxSclkHz, limitingCheck } = maxSclk(ordered, required, fraction, warnings)
  const { candidates, fastestPassing } = spiCandidates(spi, ev)

  const checks = ev.evaluate(spi.sclkHz)
  const worst = ev.worstOf(checks)
  const broken = link.channels.map((ch, i) => (notFunctional[i] ? `channel '${ch.id}': ${notFunctional[i]}` : null)).filter((r): r is string => r !== null)
  const noSlackReason = broken.length ? `the link cannot carry data (${broken.join('; ')})` : null
  if (noSlackReason) for (const c of candidates) c.pass = false
  return {
    sclkHz: spi.sclkHz,
    halfPeriod: 1 / (2 * spi.sclkHz),
    mode: spi.cpol * 2 + spi.cpha,
    checks,
    worstSlack: noSlackReason ? null : worst.slack,
    worstCheck: noSlackReason ? null : worst.id,
    noSlackReason,
    pass: !noSlackReason && checks.every((c) => c.pass),
    maxSclkHz: noSlackReason ? null : maxSclkHz,
    limitingCheck,
    roundTrip,
    candidates,
    fastestPassing: noSlackReason ? null : fastestPassing,
    warnings,
    assumptions,
  }
}
