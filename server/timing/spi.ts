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

/**
 * Slack of every SPI check, the maximum SCLK and the candidate table for an SPI link,
 * given the chain result of each of its channels (matched by channel id).
 */
export function analyzeSpi(link: Link, chains: ChainResult[], notFunctional: (string | null)[] = []): SpiResult {
  const spi = link.spi
  if (!spi) throw new Error('spi: an SPI link needs spi settings')
  const ctl = spi.controller
  const per = spi.peripheral
  const warnings: Warning[] = []
  const assumptions: string[] = [
    'SPI: the controller launches MOSI and samples MISO exactly on its own SCLK edges (no controller output delay), SCLK at 50 % duty.',
    'SPI: chip select is active low; lead runs from CS asserted to the first SCLK edge, lag from the last (trailing) SCLK edge to CS released.',
    'SPI: worst-case slacks subtract each edge\'s peak jitter; random (rms) jitter is not in them.',
    ...(spi.requiredSlackFraction ? [`SPI: each check that scales with the clock keeps at least ${Math.round(spi.requiredSlackFraction * 100)} % of the half period as slack (and every check at least the fixed required slack).`] : []),
    "SPI: channels in one isolator package differ by at most its channelSkew around their typical difference (plus the channel's own PWD for opposite edges); channels in different parts by the larger partSkew when both state one; otherwise their delay corners are independent.",
  ]

  const pathFor = (role: 'sclk' | 'mosi' | 'miso' | 'cs'): SpiPath | null => {
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
  const sclk = pathFor('sclk')
  const mosi = pathFor('mosi')
  const miso = pathFor('miso')
  const cs = pathFor('cs')
  if (!sclk || !mosi || !miso) throw new Error('spi: an SPI link needs sclk, mosi and miso channels')
  if (!cs) assumptions.push('SPI: there is no cs channel, so chip select is taken as not isolated (zero delay).')

  // ---- edges at the controller (section 3): leading edge rises when CPOL = 0
  const leading: Dir = spi.cpol === 0 ? 'rise' : 'fall'
  const trailing = flip(leading)
  const sampleEdge: Dir = spi.cpha === 0 ? leading : trailing
  const launchEdge: Dir = spi.cpha === 0 ? trailing : leading

  const jS = sclk.chain.jitterPeak
  const jM = mosi.chain.jitterPeak
  const jR = miso.chain.jitterPeak
  const jC = cs?.chain.jitterPeak ?? 0

  // ---- MOSI at the peripheral: launched at 0, sampled on the SCLK edge H later
  const sPin = pinDir(sclk, sampleEdge)
  const mosiSkew = skewBetween(spi, mosi, sclk)
  let diffMax = -Infinity
  let diffMin = Infinity
  for (const dm of ['rise', 'fall'] as const) {
    const d = delayDifference(mosi.chain, dm, sclk.chain, sPin, mosiSkew)
    diffMax = Math.max(diffMax, d.max)
    diffMin = Math.min(diffMin, d.min)
  }

  // ---- SCLK widths at the peripheral pin: high = H - (D_rise - D_fall)
  const pw = sclk.chain.pwd
  const physHigh = { c: -pw.max - 2 * jS }
  const physLow = { c: pw.min - 2 * jS }
  const logicalHigh = sclk.receiverInverts ? physLow : physHigh
  const logicalLow = sclk.receiverInverts ? physHigh : physLow

  // ---- MISO round trip: SCLK launch edge forward, clock-to-output, MISO back
  const sLaunch = delayOf(sclk, launchEdge)
  const r = { min: Math.min(miso.chain.rise.min, miso.chain.fall.min), max: Math.max(miso.chain.rise.max, miso.chain.fall.max) }
  const roundTrip = {
    min: sLaunch.min + per.clockToOut.min + r.min,
    max: sLaunch.max + per.clockToOut.max + r.max,
  }

  // ---- chip select against the first / last SCLK edge at the peripheral
  const csLeadK = ctl.csLeadTime === undefined ? 1 : 0
  const csLeadC = ctl.csLeadTime ?? 0
  const csLagK = ctl.csLagTime === undefined ? 1 : 0
  const csLagC = ctl.csLagTime ?? 0
  let leadC: number
  let lagC: number
  if (cs) {
    const csSkew = skewBetween(spi, cs, sclk)
    // CS asserted (falls at the controller) vs the first, leading, SCLK edge
    const dLead = delayDifference(cs.chain, pinDir(cs, 'fall'), sclk.chain, pinDir(sclk, leading), csSkew)
    leadC = csLeadC - dLead.max - jC - jS - per.csLead
    // CS released (rises) vs the last, trailing, SCLK edge
    const dLag = delayDifference(cs.chain, pinDir(cs, 'rise'), sclk.chain, pinDir(sclk, trailing), csSkew)
    lagC = csLagC + dLag.min - jC - jS - per.csLag
  } else {
    const sLead = delayOf(sclk, leading)
    const sTrail = delayOf(sclk, trailing)
    leadC = csLeadC + sLead.min - jS - per.csLead
    lagC = csLagC - sTrail.max - jS - per.csLag
  }

  const delayed = ctl.delayedSampling ?? false
  const lin: Record<SpiCheckId, { k: number; c: number; description: string }> = {
    'mosi-setup': {
      k: 1,
      c: -diffMax - jM - jS - per.mosiSetup,
      description: 'MOSI valid before the sampling SCLK edge at the peripheral, less its setup time',
    },
    'mosi-hold': {
      k: 1,
      c: diffMin - jM - jS - per.mosiHold,
      description: 'MOSI held after the sampling SCLK edge at the peripheral, less its hold time',
    },
    'sclk-high': { k: 1, c: logicalHigh.c - per.sclkHighMin, description: 'SCLK high time at the peripheral (half period changed by PWD) less its minimum' },
    'sclk-low': { k: 1, c: logicalLow.c - per.sclkLowMin, description: 'SCLK low time at the peripheral (half period changed by PWD) less its minimum' },
    'miso-setup': {
      k: delayed ? 2 : 1,
      c: -roundTrip.max - jS - jR - ctl.misoSetup,
      description: delayed
        ? "MISO round trip against the controller's delayed sampling edge (one half-cycle later), less its setup time"
        : "MISO round trip against the controller's sampling edge, less its setup time",
    },
    'miso-hold': {
      k: delayed ? 0 : 1,
      c: roundTrip.min - jS - jR - ctl.misoHold,
      description: "MISO held after the controller's sampling edge (next bit's round trip), less its hold time",
    },
    'cs-lead': { k: csLeadK, c: leadC, description: 'CS asserted before the first SCLK edge at the peripheral, less its lead time' },
    'cs-lag': { k: csLagK, c: lagC, description: 'CS released after the last SCLK edge at the peripheral, less its lag time' },
    'pulse-width': { k: 1, c: 0, description: '' },
  }
  // the shortest pulse a stage passes (digital isolators): an SCLK half period less its PWD,
  // a data bit (a whole period) less its PWD; the tightest channel sets the check
  const ids: SpiCheckId[] = [...SPI_CHECK_IDS]
  let pulse: { k: number; c: number; what: string } | null = null
  for (const [path, k] of [
    [sclk, 1],
    [mosi, 2],
    [miso, 2],
    ...(cs ? [[cs, 2] as const] : []),
  ] as const) {
    const ch = link.channels.find((c) => c.id === path.id)!
    const need = Math.max(0, ...ch.stages.map((st) => (st.kind === 'digital' ? Math.max(st.minPulseWidth ?? 0, st.glitchFilter ?? 0, st.maxDataRate ? 1 / st.maxDataRate : 0) : 0)))
    if (need <= 0) continue
    const c = -Math.max(Math.abs(path.chain.pwd.min), Math.abs(path.chain.pwd.max)) - need
    // compare at the largest half period where the check binds first: the smaller k*H + c
    if (!pulse || c / k < pulse.c / pulse.k) pulse = { k, c, what: `'${path.id}' pulses against its stages' ${need * 1e9 >= 1 ? `${Number((need * 1e9).toPrecision(3))} ns` : `${need} s`} minimum` }
  }
  if (pulse) {
    lin['pulse-width'] = { k: pulse.k, c: pulse.c, description: `Shortest pulse through the isolators (${pulse.what}), after the channel's PWD` }
    ids.push('pulse-width')
  }

  const required = spi.requiredSlack ?? 0
  const fraction = spi.requiredSlackFraction ?? 0
  /** what a check must keep at half period H: the fixed slack, and for checks that scale with the clock a fraction of H */
  const requiredAt = (k: number, H: number) => Math.max(required, k > 0 ? fraction * H : 0)
  const evaluate = (sclkHz: number) => {
    const H = 1 / (2 * sclkHz)
    return ids.map((id): SpiCheck => {
      const { k, c, description } = lin[id]
      const slack = k * H + c
      const need = requiredAt(k, H)
      return { id, slack, slackFraction: slack / H, required: need, pass: slack >= need, slope: k, offset: c, description }
    })
  }
  const worstOf = (checks: SpiCheck[]) =>
    checks.reduce((w, c) => (c.slack - c.required < w.slack - w.required ? c : w), checks[0]!)

  // ---- maximum SCLK, closed form
  let hMin = 0
  let limitingCheck: SpiCheckId | null = null
  let impossible: SpiCheckId | null = null
  for (const id of ids) {
    const { k, c } = lin[id]
    if (k === 0) {
      if (c < required && impossible === null) impossible = id
      continue
    }
    // k H + c >= requiredSlack and k H + c >= fraction H (fraction < 1 <= k)
    const h = Math.max((required - c) / k, fraction > 0 ? -c / (k - fraction) : -Infinity)
    if (h > hMin) {
      hMin = h
      limitingCheck = id
    }
  }
  let maxSclkHz: number | null
  if (impossible !== null) {
    maxSclkHz = null
    limitingCheck = impossible
    warnings.push({
      code: 'no-pass',
      message: `No SCLK passes: ${impossible} does not depend on SCLK and misses the required slack.`,
    })
  } else if (hMin <= 1 / (2 * SPI_SCLK_CAP)) {
    maxSclkHz = SPI_SCLK_CAP
    limitingCheck = null
    warnings.push({ code: 'rate-cap', message: `No check limits SCLK up to ${SPI_SCLK_CAP / 1e6} MHz; the cap is reported.` })
  } else {
    maxSclkHz = 1 / (2 * hMin)
  }

  // ---- candidates: prescaler steps of the controller clock, else a 1-2-5 list
  const candidates: SpiCandidate[] = []
  if (ctl.clockHz !== undefined) {
    const steps = [...new Set(ctl.prescalers ?? DEFAULT_PRESCALERS)].sort((a, b) => a - b)
    for (const p of steps) candidates.push(candidate(ctl.clockHz / p, p))
  } else {
    for (const f of STANDARD_SCLK) candidates.push(candidate(f, null))
  }
  function candidate(f: number, prescaler: number | null): SpiCandidate {
    const checks = evaluate(f)
    const w = worstOf(checks)
    return { sclkHz: f, prescaler, worstSlack: w.slack, worstCheck: w.id, pass: checks.every((c) => c.pass) }
  }
  let fastestPassing: number | null = null
  for (let i = 0; i < candidates.length; i++) {
    const c = candidates[i]!
    if (c.pass && (fastestPassing === null || c.sclkHz > candidates[fastestPassing]!.sclkHz)) fastestPassing = i
  }

  const checks = evaluate(spi.sclkHz)
  const worst = worstOf(checks)
  const broken = link.channels.map((ch, i) => (notFunctional[i] ? `channel '${ch.id}': ${notFunctional[i]}` : null)).filter((x): x is string => x !== null)
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
