/**
 * The engine's result contract (timing-model.md): every type a caller of the engine reads,
 * defined once here and imported by the engine (server/timing), the API, the UI, the
 * report renderers and the exports. Field names are a public contract: add fields, never
 * rename them. Times are SI seconds, voltages volts, and so on, unless a field says otherwise.
 */
import type { DelaySpec, Link, UartSettings } from '../schemas/link'

// ---------------------------------------------------------------- Edges and stages (timing-model.md section 1)

/** A {min, typ, max} triple in seconds. */
export type Corners = DelaySpec

/** Output edge shape: actively driven (ramp) or a resistor charging a capacitance. */
export type EdgeShape = 'ramp' | 'exponential'

/** A warning in plain words, with a stable code for the UI and tests. */
export interface Warning {
  code:
    | 'extrapolation'
    | 'slow-edge'
    | 'unsaturated'
    | 'inverted-polarity'
    | 'absolute-maximum'
    | 'single-point-fit'
    | 'rate-cap'
    | 'no-pass'
    | 'generator-error'
    | 'threshold-unreachable'
    | 'other'
  message: string
  channel?: string
  stage?: number
}

/**
 * What the chain needs from any stage: its behaviour for one output direction.
 * Every stage kind (digital, phototransistor, wire, rc) is reduced to this.
 */
export interface StageEdgeModel {
  /** the stage inverts the logic level */
  inverting: boolean
  /** delay when the OUTPUT goes low-to-high, 50 % to 50 %, seconds */
  tplh: Corners
  /** delay when the OUTPUT goes high-to-low, 50 % to 50 %, seconds */
  tphl: Corners
  /** |tPLH - tPHL| bound for one part, seconds (tighter than the corners), if stated */
  pwdMax?: number
  /** output rise time 10-90 %, seconds {typ, max}; 0 for an ideal edge */
  tr: { typ: number; max: number }
  /** output fall time 90-10 %, seconds {typ, max} */
  tf: { typ: number; max: number }
  riseShape: EdgeShape
  fallShape: EdgeShape
  /** output swing, volts */
  vLow: number
  vHigh: number
  partSkew: number
  jitterRms: number
  jitterPeak: number
  /**
   * Output directions in which the stage does not re-switch but passes its input edge on
   * (shape, transition time and swing kept), delayed by tPLH / tPHL: both directions of a
   * wire, the actively driven direction of an rc stage. Absent: the stage switches at its
   * input threshold in both directions.
   */
  passThrough?: { rise: boolean; fall: boolean }
}

/**
 * The chain result of one channel (timing-model.md section 1). Directions are those of
 * the edge at the RECEIVING PIN (physical, before the receiver's own `invert`); delays
 * run from the driving pin's 50 % crossing to the receiver's switching instant.
 */
export interface ChainResult {
  id: string
  role: string
  /** delay of an edge that rises at the receiving pin, seconds */
  rise: Corners
  /** delay of an edge that falls at the receiving pin, seconds */
  fall: Corners
  /** signed D_rise - D_fall, worst-case interval, seconds */
  pwd: { min: number; max: number }
  /** statistical spread (1 sigma) of D_rise - D_fall, seconds (root-sum-square) */
  pwdSigma: number
  /** kept: the receiving pin follows the driving pin; inverted: an odd number of inverting stages */
  polarity: 'kept' | 'inverted'
  /** received 10-90 % rise and 90-10 % fall times at the receiving pin, seconds */
  tr: { typ: number; max: number }
  tf: { typ: number; max: number }
  riseShape: EdgeShape
  fallShape: EdgeShape
  /** random jitter at the receiver, rms seconds (root-sum-square over stages) */
  jitterRms: number
  /** bounded jitter at the receiver, peak seconds (sum over stages) */
  jitterPeak: number
  /** part-to-part skew bound of the whole chain, seconds (sum over stages) */
  partSkew: number
  warnings: Warning[]
}


// ---------------------------------------------------------------- Phototransistor coupler (section 5)

/** The calibrated parameters of one coupler. */
export interface ChargeControlParams {
  /** storage time constant of the saturated output transistor, seconds */
  tauS: number
  /** effective Miller capacitance hFE x C_CB, farads */
  cMiller: number
  /** first-order lag of the LED and photodiode response, seconds */
  tauLed: number
  /** base charge before the collector conducts, as collector current x time (hFE x Q), ampere-seconds */
  qOn: number
}

export type SwitchingQuantity = 'tplh' | 'tphl' | 'tr' | 'tf'

/** Static operating point of the stage. */
export interface PhototransistorOperating {
  /** LED forward current, amperes */
  ledCurrent: number
  /** collector current needed to pull the output to VCE(sat), amperes */
  icRequired: number
  /** collector current available with the derated minimum CTR, less what R_BE diverts, amperes */
  icAvailable: number
  /** icAvailable / icRequired (>= 1 saturates) */
  overdrive: number
  saturated: boolean
  /** static on-state package dissipation (LED + transistor), watts */
  power: number
}

/** What the calibrated model says about the stage, for the form and the report. */
export interface CouplerModelInfo {
  /** calibrated charge-control parameters (at the stated or assumed typical CTR) */
  params: ChargeControlParams
  /** how well they reproduce the points: relative residuals */
  fit: { values: number; points: number; rmsRelative: number; maxRelative: number; residuals: Partial<Record<SwitchingQuantity, number>>[] }
  /** the typical CTR used, fraction, and whether it was assumed */
  ctrTyp: number
  ctrTypAssumed: boolean
  /** the output transistor's gain used, and whether it was assumed */
  hfe: number
  hfeAssumed: boolean
  /** at the stage's operating point: storage delay and edge time constant, seconds; typical overdrive */
  storage: number
  tau: number
  typicalOverdrive: number
  /** collector current R_BE diverts at turn-on (VBE high), amperes */
  rbeCurrent: number
  /** the characterised box: [min, max] of the points' pull-ups, LED currents and loads */
  range: { rl: [number, number]; ledCurrent: [number, number]; loadCap: [number, number] }
  outsideRange: boolean
  /** the conditions each point was taken at, as used (defaults filled in) */
  pointConditions: { rl: number; ledCurrent: number; loadCap: number; vcc: number; rbe: number | null; assumed: string[] }[]
}


// ---------------------------------------------------------------- UART clocks and margins (section 2)

export type Parity = UartSettings['parity']

export type Vote = 'single' | 'majority' | 'all'

export interface BaudGeneratorResult {
  /** the divisor the generator is programmed with (a multiple of 1/2^fractionBits, >= 1) */
  divisor: number
  /** the rate it produces, baud */
  actualBaud: number
  /** actualBaud / baud - 1 (signed fraction; +0.0064 = +0.64 %) */
  error: number
  /** false when the rate needs a divisor below 1: the generator cannot produce it (the divisor is held at 1) */
  reachable: boolean
  /** the divisor has a fractional part: the tick periods alternate and the samples are unevenly spaced */
  fractional: boolean
}

/** Bit-rate error interval of one end, fractions of the nominal rate (rate = baud * (1 + e)). */
export interface RateErrorBounds {
  /** lowest rate error, fraction (negative: slow) */
  min: number
  /** highest rate error, fraction */
  max: number
  /** the generator's divisor and quantisation error, when the end has a generator */
  generator: BaudGeneratorResult | null
  /** the oscillator tolerance used, ppm */
  tolerancePpm: number
}

export interface SamplerModel {
  kind: 'ticks' | 'ideal'
  oversampling: number | null
  ticks: number[] | null
  vote: Vote | null
  /** position of the sample deciding the early side, receiver bit times after the bit's nominal start */
  early: number
  /** position of the sample deciding the late side, receiver bit times */
  late: number
  /** largest detection latency, receiver bit times (1/N; 0 for the ideal sampler) */
  latency: number
  /** how far a fractional divisor moves each sample off its even position, receiver bit times (absent: integer divisor) */
  fractionalSpread?: number
}

export type LimitedBy = 'asymmetry' | 'clock' | 'sampling' | 'jitter'

/** Distortion of the received edges, seconds, logical directions. */
export interface Distortion {
  /** D_rise - D_fall interval (logical), seconds */
  pwd: { min: number; max: number }
  /** peak jitter of one edge, seconds */
  jitterPeak: number
  /** rms jitter of one edge, seconds */
  jitterRms: number
}

/** Rate error intervals of both ends, fractions (rate = baud * (1 + e)). */
export interface ClockErrors {
  tx: { min: number; max: number }
  rx: { min: number; max: number }
}

export interface MarginLosses {
  /** sample position and detection latency against an ideal mid-bit sample, seconds */
  sampling: number
  /** both clocks' error over the bits from the sync edge, seconds */
  clock: number
  /** PWD, seconds */
  asymmetry: number
  /** peak jitter of the edge and of the sync edge, seconds */
  jitter: number
}

export interface UartBitResult {
  index: number
  label: string
  /** worst early margin, seconds */
  earlyMargin: number
  /** worst late margin, seconds; null when the bit's run never ends for any data value */
  lateMargin: number | null
  /** min(early, late), seconds */
  margin: number
  /** margin in unit intervals (nominal bit times) */
  marginUi: number
  earlyMarginUi: number
  lateMarginUi: number | null
  /** data value that gives this bit its worst margin */
  worstPattern: number
  earlyPattern: number
  latePattern: number | null
  /** the side that sets the margin */
  side: 'early' | 'late'
  /** the largest loss on that side */
  limitedBy: LimitedBy
  losses: MarginLosses
  /** the deciding samples relative to the start edge's arrival, seconds: earliest (early side), latest (late side) */
  samples: { earliest: number; latest: number }
  /** worst-case valid window of the bit's run relative to the start edge's arrival, seconds (validTo null: no end) */
  validFrom: number
  validTo: number | null
}

export interface MaxBaudResult {
  /** highest baud meeting the required margin; the cap when distortion never limits below it; null when no rate passes */
  maxBaud: number | null
  cap: number
  capped: boolean
  /** the bit (and side) that sets it; null when capped or when nothing passes because of a distortion-free term */
  limitedBy: { index: number; label: string; side: 'early' | 'late' } | null
  note: string
}

export interface ClockTolerance {
  /** lowest incoming rate / receiver rate that still meets the required margin; null when none does */
  slowest: number | null
  /** highest incoming rate / receiver rate; null when none does */
  fastest: number | null
  /** the bits that set each bound */
  slowestBit: number | null
  fastestBit: number | null
}

export interface StandardRateRow {
  baud: number
  /** worst margin at this rate, UI; null when the link cannot carry data or a generator cannot produce the rate */
  marginUi: number | null
  pass: boolean
  /** the receiver's generator divisor at this rate (else the transmitter's), null without a generator */
  divisor: number | null
  /** that generator's quantisation error, signed fraction */
  error: number | null
  generators: { tx: BaudGeneratorResult | null; rx: BaudGeneratorResult | null }
  /** why the rate fails without a margin (a generator cannot produce it, a pulse too short for a stage) */
  note: string | null
}

export interface BerEstimate {
  berTarget: number
  /** Q(berTarget) = Phi^-1(1 - BER) */
  q: number
  /** random jitter of one received edge, rms seconds */
  rjRms: number
  /** deterministic (bounded) jitter, peak to peak seconds (twice the peak) */
  djPeakToPeak: number
  /** dual-Dirac total jitter at berTarget, seconds */
  totalJitter: number
  totalJitterUi: number
  /** rms spread of an edge against the sync edge (both jitter), seconds */
  edgeSigma: number
  /** per sampled bit: probability that random jitter carries an edge past a worst-case margin */
  bits: { index: number; label: string; errorProbability: number }[]
  /** the worst bit's error probability */
  worstBitErrorProbability: number
  /** probability that a frame has at least one bit error */
  frameErrorProbability: number
  meetsTarget: boolean
}

/** The shortest pulse a stage in the chain passes, and the check of the frame's shortest pulse against it. */
export interface PulseCheck {
  /** the stage that needs the longest pulse */
  stage: string
  /** shortest pulse it passes (minimum pulse width, glitch filter, maximum data rate), seconds */
  required: number
  /** the frame's shortest pulse at the configured rate: one fast transmitter bit less the chain's worst |PWD|, seconds */
  shortest: number
  pass: boolean
}

export interface UartChannelResult {
  channelId: string
  baud: number
  /** nominal bit time 1 / baud, seconds */
  bitTime: number
  frame: { dataBits: number; parity: Parity; stopBits: number; backToBack: boolean; frameBits: number }
  sampler: SamplerModel
  clocks: { tx: RateErrorBounds; rx: RateErrorBounds }
  /** the distortion the margins use (logical directions) */
  distortion: Distortion
  requiredMarginUi: number
  /** per-bit margins at the configured rate; empty when no margin is computed (see `noMarginReason`) */
  bits: UartBitResult[]
  /** the worst margin, UI; null when the link cannot carry data at the configured rate */
  worstMarginUi: number | null
  worstBit: number | null
  verdict: 'pass' | 'marginal' | 'fail'
  /** the channel can carry data at all (polarity, thresholds, saturated output, an output that switches) */
  functional: boolean
  /** why no margin is computed at the configured rate (not functional, a rate a generator cannot produce, a lost pulse); null when computed */
  noMarginReason: string | null
  maxBaud: number | null
  maxBaudCap: number
  maxBaudCapped: boolean
  maxBaudLimitedBy: MaxBaudResult['limitedBy']
  maxBaudNote: string
  clockTolerance: ClockTolerance
  rateSweep: { baud: number; marginUi: number }[]
  standardRates: StandardRateRow[]
  /** the fastest standard rate that passes, null when none does */
  fastestStandardRate: number | null
  /** the shortest-pulse check of the chain's digital stages; null when none states a limit */
  pulseCheck: PulseCheck | null
  berEstimate: BerEstimate
  /**
   * Statistical view of the asymmetry (timing-model.md section 1): the chain PWD as its
   * nominal value +- 3 sigma (root-sum-square of the stages' spreads), within the worst-case
   * interval, at the configured clocks and jitter; null without pwdTyp / pwdSigma.
   */
  statistical: { pwd: { min: number; max: number }; worstMarginUi: number } | null
  /** the bit timeline's geometry in time (the chart only places it); set by analyzeLink */
  timeline?: UartTimeline
  warnings: Warning[]
}

/** How one lane of the bit timeline moves the ideal edges: delays from the driving pin's 50 % crossing, seconds. */
export interface TimelineEdges {
  rise: number
  fall: number
  /** corner range of each delay (drawn as a band); null when the lane shows typical values only */
  riseRange: { min: number; max: number } | null
  fallRange: { min: number; max: number } | null
  /** 10-90 % transition times, seconds */
  tr: number
  tf: number
  riseShape: EdgeShape
  fallShape: EdgeShape
}

/** One lane: the sent frame, the output of a stage, the receiving pin, or what the UART sees after its own inversion. */
export interface TimelineLane {
  kind: 'sent' | 'stage' | 'received' | 'uart'
  /** the stage's name (kind 'stage') */
  stage: string | null
  /** the lane's level is the opposite of the logical frame */
  inverted: boolean
  edges: TimelineEdges
}

/**
 * The bit timeline in time (timing-model.md section 2): every rule is the engine's (frame
 * and parity, the delays through each stage, the receiver's inversion), so a chart only
 * places these numbers. The sampling instants and valid windows are the bits' own
 * (UartBitResult.samples, validFrom, validTo, relative to `sync`).
 */
export interface UartTimeline {
  /** labels of the frame's cells, start bit to the last stop bit */
  cells: string[]
  /** per data value v, the logical level of cell j is bit j of levels[v] */
  levels: number[]
  /** arrival of the start edge at the UART (its logical fall), seconds after it left the driving pin */
  sync: number
  lanes: TimelineLane[]
}


// ---------------------------------------------------------------- SPI (section 3)

export type SpiCheckId = 'mosi-setup' | 'mosi-hold' | 'sclk-high' | 'sclk-low' | 'miso-setup' | 'miso-hold' | 'cs-lead' | 'cs-lag' | 'pulse-width'

export interface SpiCheck {
  id: SpiCheckId
  /** slack at the link's SCLK, seconds (negative: violated) */
  slack: number
  /** slack as a fraction of the half period */
  slackFraction: number
  /** the guard every check must keep (spi.requiredSlack), seconds */
  required: number
  pass: boolean
  /** slack = slope * halfPeriod + offset: how the check scales with SCLK */
  slope: number
  offset: number
  /** what is compared, in words */
  description: string
}

export interface SpiCandidate {
  sclkHz: number
  /** controller prescaler divisor, null when the frequency is from the standard list */
  prescaler: number | null
  worstSlack: number
  worstCheck: SpiCheckId
  pass: boolean
}

export interface SpiResult {
  sclkHz: number
  halfPeriod: number
  /** SPI mode number 2*CPOL + CPHA */
  mode: number
  checks: SpiCheck[]
  /** the smallest slack less its requirement, seconds; null when the link cannot carry data */
  worstSlack: number | null
  worstCheck: SpiCheckId | null
  /** why no slack is computed (a channel cannot carry data); null when computed */
  noSlackReason: string | null
  /** every check meets requiredSlack at sclkHz */
  pass: boolean
  /** highest SCLK meeting every check, hertz; null when no SCLK passes */
  maxSclkHz: number | null
  /** the check that sets maxSclkHz (null when no check limits it up to the cap) */
  limitingCheck: SpiCheckId | null
  /** SCLK forward + clock-to-output + MISO return, seconds */
  roundTrip: { min: number; max: number }
  candidates: SpiCandidate[]
  /** index in candidates[] of the fastest passing one, null when none passes */
  fastestPassing: number | null
  warnings: Warning[]
  assumptions: string[]
}


// ---------------------------------------------------------------- Pull-up sweep (section 5)

export interface PullupSweepOptions {
  /** E series for both RL and the LED resistor */
  series: 'E12' | 'E24' | 'E96'
  /** pull-up range, ohms (inclusive) */
  rlMin: number
  rlMax: number
  /** IC available / IC needed that the LED current must give (default 1: the derating factors carry the margin) */
  overdrive?: number
  /** baud at which each row's margin is computed (default: the link's baud) */
  targetBaud?: number
  /** base-emitter resistor range swept over E12 when the stage has one, ohms (default 47 kOhm to 1 MOhm) */
  rbeMin?: number
  rbeMax?: number
}

export interface PullupSweepRow {
  /** pull-up (load) resistor, ohms */
  rl: number
  /** base-emitter resistor of the row, ohms; null: open base */
  rbe: number | null
  /** collector current for saturation, (VCC - VCE(sat)) / RL, amperes */
  ic: number
  /** LED current giving ic x overdrive (plus what RBE diverts) with the derated minimum CTR, amperes */
  ledCurrentRequired: number
  /** largest standard LED resistor that still gives ledCurrentRequired, ohms; null when the drive cannot */
  rLed: number | null
  /** LED current with that resistor, amperes; null when the drive cannot light the LED */
  ledCurrent: number | null
  /** overdrive actually reached with rLed */
  overdrive: number
  /** static on-state coupler dissipation, watts */
  power: number
  /** predicted typical switching times at this RL, IF and RBE, seconds */
  tplh: number
  tphl: number
  tr: number
  tf: number
  /** no absolute maximum exceeded, output saturates */
  withinRatings: boolean
  /** the link's worst margin at the target baud meets its required margin */
  meetsTarget: boolean
  /** withinRatings and meetsTarget */
  feasible: boolean
  /** why the row is not feasible, ratings first (empty when it is) */
  reasons: string[]
  /** other warnings for this row that are not stated once for the whole sweep */
  notes: string[]
  /** the link's worst margin at the target baud (worst uart direction), UI; null when not computed (the link cannot carry data) */
  marginUi: number | null
  /** the link's highest baud meeting the required margin (lowest over its directions); null when none (or not computed) */
  maxBaud: number | null
  /** the analysis verdict at the target baud */
  verdict: Verdict | null
  /** feasible and faster (higher maxBaud) than the recommended row */
  fasterAlternative: boolean
}

/** A circuit change evaluated when no row meets the target. */
export interface SweepAdvice {
  change: 'rbe' | 'schmitt-buffer' | 'logic-output-coupler' | 'lower-rate'
  /** what to do, in words */
  description: string
  /** the link's worst margin at the target baud with the change, UI (null: not computed) */
  marginUi: number | null
  /** the link's maximum baud with the change */
  maxBaud: number | null
  /** that maximum is the search limit (the link is faster still): read it as "at least" */
  maxBaudCapped: boolean
  meetsTarget: boolean
}

export interface PullupSweepResult {
  channelId: string
  stageIndex: number
  series: 'E12' | 'E24' | 'E96'
  targetBaud: number
  overdrive: number
  requiredMarginUi: number
  rows: PullupSweepRow[]
  /** the RBE values swept (E12), empty when the stage has no base-emitter resistor */
  rbeValues: number[]
  /** index of the recommended row, null when no row is feasible */
  recommended: number | null
  /** indices of the faster feasible alternatives, fastest first */
  alternatives: number[]
  /** notes that hold for every row, stated once (extrapolation of the model, assumed CTR ...) */
  commonNotes: string[]
  /** the stage's characterisation points, for the plot (times in seconds) */
  points: { rl: number; ledCurrent: number | null; tplh?: number; tphl?: number; tr?: number; tf?: number }[]
  /** when no row meets the target: the highest rate a row within ratings reaches, and the changes that would */
  advice: { bestRow: number | null; reachedBaud: number | null; options: SweepAdvice[] } | null
  assumptions: string[]
}


// ---------------------------------------------------------------- Spread study (section 7)

export interface HistogramBin {
  /** lower edge (inclusive) */
  lo: number
  /** upper edge (exclusive, inclusive for the last bin) */
  hi: number
  count: number
}

export interface SpreadStudyOptions {
  /** number of trials (default 10 000, at most 1 000 000) */
  trials?: number
  /** seed of the random generator (default 1) */
  seed?: number
  /** how a stage's delay is drawn within its corners (default uniform) */
  distribution?: 'uniform' | 'normal'
  /** histogram bins (default 40) */
  bins?: number
}

export interface SpreadStudyResult {
  engineVersion: string
  trials: number
  seed: number
  distribution: 'uniform' | 'normal'
  /** trials whose worst margin is below 0 UI (a bit read wrong) */
  failures: number
  failFraction: number
  /** trials below the link's required margin */
  belowRequired: number
  belowRequiredFraction: number
  requiredMarginUi: number
  /** quantiles of the frame's worst margin, UI (p1 = 1st percentile) */
  worstMarginUi: { min: number; p1: number; p5: number; p25: number; p50: number; p75: number; p95: number; p99: number; max: number; mean: number }
  histogram: HistogramBin[]
  /** the uart channels included */
  channels: string[]
  /** wall time of the trial loop, milliseconds (informational) */
  elapsedMs: number
}


// ---------------------------------------------------------------- The link analysis (section 8)

export type Verdict = 'pass' | 'marginal' | 'fail'

/** One channel as the result reports it (physical directions at the receiving pin): the chain result without its warnings (they join the link's list), plus what a report shows of it. */
export interface ChannelResult extends Omit<ChainResult, 'warnings'> {
  /** nominal D_rise - D_fall, seconds */
  pwdTyp: number
  /** the receiving pin's own contribution to D_rise - D_fall, seconds */
  receiverTerm: Corners
  /** the channel can carry data at all (polarity, reachable thresholds, saturated outputs) */
  functional: boolean
  stages: {
    index: number
    name: string
    kind: string
    inverting: boolean
    tplh: Corners
    tphl: Corners
    tr: { typ: number; max: number }
    tf: { typ: number; max: number }
    /** this stage's rising minus falling output delay, threshold offsets included, seconds */
    asymmetry: Corners
    /** the sign with which that enters the chain PWD */
    sign: 1 | -1
    operating?: { ledCurrent: number; icRequired: number; icAvailable: number; overdrive: number; saturated: boolean; power: number }
    /** the calibrated phototransistor model (phototransistor stages) */
    coupler?: CouplerModelInfo
  }[]
}

export interface UartResult extends UartChannelResult {
  /** every uart channel's analysis (the top level repeats the worst one) */
  byChannel: UartChannelResult[]
}

export interface LinkAnalysis {
  engineVersion: string
  verdict: Verdict
  channels: ChannelResult[]
  uart: UartResult | null
  spi: SpiResult | null
  /** I2C links: every check, the highest SCL and the pull-up sweep (null for other protocols) */
  i2c: I2cLinkResult | null
  /** CAN links: the bit-timing table, the chosen setting's checks, the longest bus (null for other protocols) */
  can: CanLinkResult | null
  /** RS-485 links: the driver-enable turnaround (the data itself is in `uart`; null for other protocols) */
  rs485: Rs485LinkResult | null
  assumptions: string[]
  warnings: Warning[]
  /** the full parsed input (defaults filled in) */
  input: Link
}


// ---------------------------------------------------------------- CAN bit timing (section 4)

/** One node's path between its CAN controller and the bus, through its isolator and transceiver, seconds (maximum values). */
export interface CanNodeDelays {
  /** isolator, controller TXD side to transceiver: propagation delay */
  isolatorTx: number
  /** transceiver driver: TXD to bus */
  driver: number
  /** transceiver receiver: bus to RXD */
  receiver: number
  /** isolator, transceiver RXD to controller */
  isolatorRx: number
}

/** A bit-timing setting of a CAN controller and what it allows (ISO 11898-1 bit time: Sync_Seg 1 tq + Prop_Seg + Phase_Seg1 + Phase_Seg2). */
export interface CanBitTiming {
  /** baud-rate prescaler: tq = prescaler / CAN clock */
  prescaler: number
  tq: number
  /** time quanta per bit */
  tqPerBit: number
  propSeg: number
  phaseSeg1: number
  phaseSeg2: number
  sjw: number
  /** (1 + Prop_Seg + Phase_Seg1) / tqPerBit */
  samplePoint: number
  /** oscillator tolerance by condition I (resynchronisation over 13 bits) and II (one SJW per 10 bits), and the smaller */
  toleranceI: number
  toleranceII: number
  tolerance: number
  /** Prop_Seg covers the round trip between the two most distant nodes */
  loopFits: boolean
  /** longest bus for which it would still fit, metres (null when even 0 m does not) */
  maxLength: number | null
}


// ---------------------------------------------------------------- I2C bus sides (section 4)

export type I2cMode = 'standard' | 'fast' | 'fast-plus'

/** One side of an isolated I2C bus (SCL or SDA line): its supply, pull-up, capacitance and the lowest VIL of its devices. */
export interface I2cSideInput {
  vdd: number
  /** pull-up resistor, ohms */
  rp: number
  /** bus capacitance of the line on this side, farads */
  cb: number
  /** the highest low level a driver on this side leaves (VOL at its sink current), volts; default the mode's 0.4 V (0.2 VDD at 2 V or less) */
  vol?: number
  /** the lowest VIL of the devices on this side, volts; default 0.3 VDD */
  vilMin?: number
  /** a static low-level offset the isolator puts on this side (some bidirectional isolators drive their low a few hundred mV above ground), volts */
  isolatorLowOffset?: number
}

export interface I2cSideResult {
  /** 30 %-70 % rise time 0.8473 Rp Cb, seconds */
  rise: number
  /** the mode's maximum rise time, seconds */
  riseMax: number
  /** smallest pull-up the drivers can sink: (VDD - VOL) / IOL, ohms */
  rpMin: number
  /** largest pull-up the rise time allows: tr(max) / (0.8473 Cb), ohms */
  rpMax: number
  /** the low level the devices see from the isolator, against their VIL (null without an offset) */
  offsetLow: number | null
  checks: { id: 'rise' | 'rp-min' | 'offset-vil' | 'capacitance'; pass: boolean; text: string }[]
  pass: boolean
}

/** An isolated I2C bus: the controller's side a, the target's side b, the isolator between, SCL timing of the controller. */
export interface I2cBusInput {
  mode: I2cMode
  a: I2cSideInput
  b: I2cSideInput
  isolator: {
    /** a -> b propagation delays of a falling and of a rising edge (max), seconds */
    abFall: number
    abRise: number
    /** b -> a propagation delay (max), seconds */
    ba: number
    /** input threshold of the isolator as a fraction of its side's VDD (the rising line is seen high there); default 0.5 */
    threshold?: number
  }
  /** the target's data valid time tVD;DAT (max), seconds; default the mode's limit */
  tVdDat?: number
  /** the controller's SCL frequency, hertz */
  fScl: number
  /** the controller's SCL low time as a fraction of the period; default the mode's tLOW / (tLOW + tHIGH) */
  dutyLow?: number
}

export type I2cCheckId = 'controller-low' | 'controller-high' | 'target-low' | 'target-high' | 'sda-round-trip' | 'mode-frequency'

export interface I2cBusResult {
  sides: { a: I2cSideResult; b: I2cSideResult }
  /** SCL low and high at the controller and as the target sees them, seconds */
  scl: { lowA: number; highA: number; lowB: number; highB: number }
  /** SCL falling at a to the controller's side reading the target's SDA, seconds */
  roundTrip: number
  checks: { id: I2cCheckId; value: number; limit: number; slack: number; pass: boolean }[]
  pass: boolean
  /** the highest SCL frequency meeting every timing check at this duty, hertz, and the check that sets it */
  maxFScl: number
  limitedBy: I2cCheckId
}


// ---------------------------------------------------------------- RS-485 half-duplex turnaround (section 4)

/** A half-duplex RS-485 transmitter behind isolators: the firmware's enable timing and the two paths to the bus, seconds. */
export interface Rs485TurnaroundInput {
  baud: number
  /** bits of a frame from the start bit to the end of the last stop bit (10 for 8N1) */
  frameBits: number
  /** firmware: DE asserted this long before the start bit's edge leaves TX (0 when set in the same instruction) */
  leadTime: number
  /** firmware: DE released this long after the end of the last stop bit at TX (negative: released early, e.g. on a "transmit register empty" event one bit early) */
  lagTime: number
  /** TX to the bus: isolator channel + transceiver driver propagation, min and max */
  dataPath: { min: number; max: number }
  /** DE to the transceiver: isolator channel, min and max */
  enablePath: { min: number; max: number }
  /** transceiver driver enable time (tZH / tZL, max) and disable time (tHZ / tLZ, min) */
  driverEnable: number
  driverDisable: number
}

export interface Rs485TurnaroundResult {
  /** the driver is on at the bus before the start bit's edge reaches it, with this much to spare (negative: the start bit is cut) */
  leadSlack: number
  /** the driver stays on past the end of the stop bit at the bus, with this much to spare (negative: the stop bit is cut) */
  lagSlack: number
  pass: boolean
}


// ---------------------------------------------------------------- Bus links (section 4): checks and timelines

/** One timing check of a bus link: the value against its limit, slack in seconds (negative: violated). */
export interface BusCheck {
  id: string
  /** what is checked, in words (with the specification's symbol) */
  label: string
  /** the quantity, seconds */
  value: number
  /** the limit it is held to, seconds (a minimum when `kind` is 'min', a maximum when 'max') */
  limit: number
  kind: 'min' | 'max'
  /** seconds to spare after the required slack: value - limit (min) or limit - value (max) */
  slack: number
  pass: boolean
  /** the unit of value, limit and slack: seconds unless stated ('fraction': a ratio such as a clock tolerance) */
  unit?: 's' | 'fraction'
}

/**
 * A bus timeline drawn by the engine: lanes of levels over time (0 = low, 1 = high, fractions
 * on slow edges), shaded windows (a setup window, the round trip, the enable window) and marks
 * (the sample point). Times in seconds from the timeline's origin.
 */
export interface BusTimeline {
  span: number
  lanes: { label: string; points: [number, number][] }[]
  windows: { lane: number; t0: number; t1: number; label: string; pass: boolean | null }[]
  marks: { t: number; label: string }[]
}

export interface I2cLinkResult {
  mode: I2cMode
  sclHz: number
  dutyLow: number
  /** every timing check, seconds; the limiting one decides the verdict */
  checks: BusCheck[]
  /** level checks (pull-up against Rp(min), bus capacitance, the isolator's low offset against VIL), in their own units */
  levelChecks: { id: string; side: 'controller' | 'target'; label: string; value: number; limit: number; unit: string; pass: boolean }[]
  sides: { controller: I2cSideResult; target: I2cSideResult }
  /** SCL low and high at the controller and as the target sees them, seconds */
  scl: { lowController: number; highController: number; lowTarget: number; highTarget: number }
  /** SCL falling at the controller to the controller reading the target's SDA, seconds */
  roundTrip: number
  /** the highest SCL frequency (at this duty) meeting every timing check, hertz; null when none does */
  maxSclHz: number | null
  /** the check that sets maxSclHz */
  maxSclLimitedBy: string | null
  /** the check with the least slack */
  limiting: string | null
  worstSlack: number
  pass: boolean
  /** per side, pull-ups of an E series from half Rp(min) to twice Rp(max), each with its rise and the highest SCL */
  pullupSweep: { side: 'controller' | 'target'; series: string; rows: { rp: number; rise: number; rpOk: boolean; riseOk: boolean; /** 70 %-30 % with the mode's IOL; null when the driver cannot pull the line below 0.3 VDD */ fall: number | null; fallOk: boolean; maxSclHz: number | null; current: boolean }[] }[]
  timeline: BusTimeline
}

export interface CanBitTimingRow extends CanBitTiming {
  /** the contract's names: baud-rate prescaler, and whether Prop_Seg covers the loop */
  brp: number
  loopDelayFits: boolean
}

export interface CanLinkResult {
  bitRate: number
  clockHz: number
  /** this node's output (TXD to bus) and input (bus to RXD) delays, max, seconds, from the txd and rxd channels */
  node: { outputDelay: number; inputDelay: number; loopDelay: number }
  farNode: { outputDelay: number; inputDelay: number }
  /** one-way delay of the bus, seconds */
  busDelay: number
  /** the time Prop_Seg must cover, seconds */
  propagation: number
  /** every setting of the clock for the bit rate, best first */
  bitTimings: CanBitTimingRow[]
  /** the setting analysed: the firmware's (settings.timing) or the best of the table */
  chosen: CanBitTimingRow | null
  chosenFrom: 'settings' | 'table'
  checks: BusCheck[]
  /** the longest bus at this bit rate, metres (null: not even 0 m) */
  maxBusLength: number | null
  /** for bit rates up to 1 Mbit/s: the longest bus each common rate allows, metres */
  lengthByRate: { bitRate: number; maxBusLength: number | null }[]
  fd: {
    dataBitRate: number
    dataBitTime: number
    dataSamplePoint: number
    /** how much shorter a recessive data bit arrives than it was sent (both channels' and the transceiver's asymmetry), seconds */
    recessiveShortening: number
    /** the transmitter's secondary sample point with TDC: loop delay + data sample point, seconds after the bit's start */
    secondarySamplePoint: number | null
    tdc: boolean
  } | null
  limiting: string | null
  worstSlack: number
  pass: boolean
  timeline: BusTimeline
}

export interface Rs485LinkResult {
  duplex: 'half' | 'full'
  frameBits: number
  /** TX to the bus (up to and with the first transceiver's driver), seconds */
  dataPath: { min: number; max: number }
  /** DE to the transceiver, seconds */
  enablePath: { min: number; max: number } | null
  driverEnable: number
  driverDisable: number
  checks: BusCheck[]
  /** the shortest firmware lead and lag the link allows, seconds, and the frame's cost of the turnaround */
  minLeadTime: number | null
  minLagTime: number | null
  limiting: string | null
  worstSlack: number
  pass: boolean
  timeline: BusTimeline | null
}
