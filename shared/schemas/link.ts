/**
 * The link schema: one contract for the forms, the API, JSON import/export and the
 * timing engine. All quantities are SI (seconds, volts, ohms, farads, amperes, watts,
 * hertz); the UI converts engineering notation at its edge.
 *
 * Field names here are a public contract (outside test suites call the engine with
 * them): add fields, never rename them.
 */
import { z } from 'zod'
import { cleanText } from './text'
import { ctrTypOf, ledCurrentOf, POINT_DEFAULT_LED_CURRENT, POINT_DEFAULT_LOAD_CAP, rbeDivertedCurrent, VBE_HIGH } from '../utils/coupler'

/**
 * Version of the link document. 2 added the I2C, CAN and RS-485 link types (protocols, channel
 * roles, the transceiver stage, their settings); a version 1 document is a version 2 document
 * without them and is read as it is (stored links were migrated to 2).
 */
export const LINK_SCHEMA_VERSION = 2

// ---------------------------------------------------------------- small pieces

/** A finite number with a field-specific range, so the message names the problem. */
const num = (min: number, max: number, what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .min(min, `${what} must be at least ${min}`)
    .max(max, `${what} must be at most ${max}`)

/** seconds, 0 to 1 s */
export const Seconds = num(0, 1, 'time (s)')
/** seconds, may be negative (clock-to-output min, skews) within +-1 s */
export const SignedSeconds = num(-1, 1, 'time (s)')
export const Volts = num(-100, 1000, 'voltage (V)')
export const PositiveVolts = num(0, 1000, 'voltage (V)')
export const Ohms = num(0.001, 1e9, 'resistance (ohm)')
export const Farads = num(0, 1, 'capacitance (F)')
export const Amperes = num(0, 100, 'current (A)')
export const Watts = num(0, 1000, 'power (W)')

/** Propagation delay corners, seconds, 50 % to 50 % (datasheet convention). */
export const DelaySpec = z
  .object({ min: Seconds, typ: Seconds, max: Seconds })
  .refine((d) => d.min <= d.typ && d.typ <= d.max, {
    message: 'delay corners must satisfy min <= typ <= max',
  })
export type DelaySpec = z.infer<typeof DelaySpec>

/** Transition time (10-90 % rise or 90-10 % fall), seconds. */
export const TransitionSpec = z
  .object({ typ: Seconds, max: Seconds })
  .refine((t) => t.typ <= t.max, { message: 'transition time must satisfy typ <= max' })
export type TransitionSpec = z.infer<typeof TransitionSpec>

/** A threshold given as one value or as a min/max range, volts. */
export const ThresholdSpec = z.union([
  Volts,
  z
    .object({ min: Volts, max: Volts })
    .refine((t) => t.min <= t.max, { message: 'threshold range must satisfy min <= max' }),
])
export type ThresholdSpec = z.infer<typeof ThresholdSpec>

/** The middle of a threshold given as a value or a range, volts. */
export function thresholdMid(t: ThresholdSpec): number {
  return typeof t === 'number' ? t : (t.min + t.max) / 2
}

/** Corner range of a signed time (clock-to-output, skew), seconds. */
export const TimeRange = z
  .object({ min: SignedSeconds, max: SignedSeconds })
  .refine((t) => t.min <= t.max, { message: 'range must satisfy min <= max' })
export type TimeRange = z.infer<typeof TimeRange>

// ---------------------------------------------------------------- stages

/** Fields every stage may carry. */
const stageCommon = {
  name: cleanText(z.string().trim().min(1, 'name is required').max(120, 'name is at most 120 characters'), 'name'),
  /** part-to-part delay skew bound for this stage class, seconds (both edges) */
  partSkew: Seconds.optional(),
  /** random jitter added by this stage, rms seconds */
  jitterRms: Seconds.optional(),
  /** bounded (deterministic) jitter added by this stage, peak seconds (+- this) */
  jitterPeak: Seconds.optional(),
  /**
   * The stage's own input thresholds as fractions of the previous stage's swing
   * (rising, falling). Default 0.5 / 0.5 (datasheet delays are 50 % to 50 %).
   */
  inputThreshold: z
    .object({ rise: num(0.01, 0.99, 'threshold fraction'), fall: num(0.01, 0.99, 'threshold fraction') })
    .optional(),
  /** Output swing of this stage, volts. Defaults: phototransistor vceSat..vcc, else 0..receiver vdd. */
  vLow: Volts.optional(),
  vHigh: Volts.optional(),
  /** Part library entry this stage was taken from (informational). */
  partId: cleanText(z.string().max(64), 'partId').optional(),
}

/** Thresholds of a Schmitt-trigger input, volts (each a value or a min/max range). */
export const SchmittThresholds = z
  .object({
    /** positive-going threshold VT+ */
    vtPlus: ThresholdSpec,
    /** negative-going threshold VT- */
    vtMinus: ThresholdSpec,
  })
  .refine((t) => thresholdMid(t.vtPlus) >= thresholdMid(t.vtMinus), {
    message: 'VT+ must not lie below VT- (a Schmitt input switches up at the higher threshold)',
    path: ['vtPlus'],
  })
export type SchmittThresholds = z.infer<typeof SchmittThresholds>

export const DigitalStage = z.object({
  kind: z.literal('digital'),
  ...stageCommon,
  inverting: z.boolean().default(false),
  tplh: DelaySpec,
  tphl: DelaySpec,
  /** |tPLH - tPHL| bound for one part, seconds */
  pwdMax: Seconds.optional(),
  tr: TransitionSpec.optional(),
  tf: TransitionSpec.optional(),
  edge: z.enum(['ramp', 'exponential']).default('ramp'),
  /** a Schmitt-trigger input (a buffer after a slow coupler): its thresholds, volts of the previous swing */
  schmittInput: SchmittThresholds.optional(),
  /** shortest input pulse the part passes, seconds (digital isolators); a shorter one is lost */
  minPulseWidth: Seconds.optional(),
  /** highest data rate the part is specified for, bit/s */
  maxDataRate: num(1, 10e9, 'maximum data rate (bit/s)').optional(),
  /** input glitch filter: pulses shorter than this are suppressed, seconds */
  glitchFilter: Seconds.optional(),
  /** output level when the input side loses its supply (digital isolators) */
  failsafe: z.enum(['high', 'low']).optional(),
})
export type DigitalStage = z.infer<typeof DigitalStage>

/** A switching time of a characterisation point: a real coupler never switches in zero time. */
const PointTime = z
  .number({ error: 'time (s) must be a number' })
  .gt(0, 'a characterised time must be above 0 s')
  .max(1, 'time (s) must be at most 1')

/**
 * One characterisation point read from a datasheet curve or a measurement: the times at
 * the conditions it was taken at. Conditions it does not state are taken at stated
 * defaults (LED current: the stage's CTR test current, else 10 mA; load: 0 F, an unloaded
 * test; supply: the stage's; no base-emitter resistor), never at the stage's present values.
 */
export const CharacterizationPoint = z
  .object({
    /** load (pull-up) resistance of this point, ohms */
    rl: Ohms,
    tplh: PointTime.optional(),
    tphl: PointTime.optional(),
    tr: PointTime.optional(),
    tf: PointTime.optional(),
    /** LED current at which the point was taken, amperes */
    ledCurrent: num(1e-6, 100, 'LED current (A)').optional(),
    /** load capacitance at which the point was taken, farads */
    loadCap: Farads.optional(),
    /** output supply at which the point was taken, volts */
    vcc: num(0.5, 1000, 'output supply vcc (V)').optional(),
    /** base-emitter resistor fitted when the point was taken, ohms */
    rbe: Ohms.optional(),
  })
  .refine((p) => p.tplh !== undefined || p.tphl !== undefined || p.tr !== undefined || p.tf !== undefined, {
    message: 'a characterisation point needs at least one of tplh, tphl, tr, tf',
    path: ['tplh'],
  })
export type CharacterizationPoint = z.infer<typeof CharacterizationPoint>

export const PhototransistorStage = z
  .object({
    kind: z.literal('phototransistor'),
    ...stageCommon,
    /** collector: common emitter with collector pull-up (inverting); emitter: follower with emitter resistor */
    wiring: z.enum(['collector', 'emitter']).default('collector'),
    /** the input level that lights the LED (a pin that sinks the LED current lights it when low) */
    ledOnWhen: z.enum(['high', 'low']).default('high'),
    /** LED drive voltage (the driving pin's swing), volts */
    driveVoltage: PositiveVolts,
    /** LED forward voltage, volts */
    vf: PositiveVolts,
    /** LED series resistor, ohms (or give ledCurrent) */
    rLed: Ohms.optional(),
    /** LED forward current, amperes (instead of rLed) */
    ledCurrent: Amperes.optional(),
    /** what drives the LED: a logic pin (its current limit applies) or a transistor switch */
    driver: z.enum(['pin', 'transistor']).default('pin'),
    /** the driver's own output drop at the drive current (V_OL or V_OH), volts; default by driver */
    driverDrop: num(0, 5, 'driver output drop (V)').optional(),
    /** minimum current transfer ratio as a fraction (0.2 = 20 %) at ctrTestCurrent */
    ctrMin: num(0.0001, 100, 'CTR (fraction)'),
    /** typical current transfer ratio as a fraction; default a stated multiple of ctrMin */
    ctrTyp: num(0.0001, 100, 'typical CTR (fraction)').optional(),
    /** LED current at which ctrMin is specified, amperes */
    ctrTestCurrent: Amperes.optional(),
    /** multiplicative CTR derating factors (0..1] */
    ctrDerating: z
      .object({
        temperature: num(0.01, 1, 'CTR temperature derating').default(1),
        endOfLife: num(0.01, 1, 'CTR end-of-life derating').default(1),
      })
      .default({ temperature: 1, endOfLife: 1 }),
    /** output supply, volts (a coupler output below half a volt switches nothing) */
    vcc: num(0.5, 1000, 'output supply vcc (V)'),
    /** collector (or emitter) load resistor, ohms */
    rl: Ohms,
    /** collector-emitter saturation voltage, volts */
    vceSat: PositiveVolts.default(0.4),
    /** load capacitance on the output node, farads */
    loadCap: Farads.default(0),
    /** base-emitter resistor (parts with a base pin), ohms: a speed-up that costs CTR */
    rbe: Ohms.optional(),
    /** current gain of the output transistor (needed with rbe); default stated in the assumptions */
    hfe: num(1, 100000, 'current gain hfe').optional(),
    ledCurrentMax: Amperes.optional(),
    collectorCurrentMax: Amperes.optional(),
    /** total package dissipation limit, watts */
    powerMax: Watts.optional(),
    /** the driving pin's current limit, amperes (default by driver: 20 mA for a pin, none for a transistor) */
    driverCurrentMax: Amperes.optional(),
    characterization: z.array(CharacterizationPoint).min(1, 'at least one characterisation point is needed').max(32),
  })
  .refine((s) => s.rLed !== undefined || s.ledCurrent !== undefined, {
    message: 'give rLed or ledCurrent',
    path: ['rLed'],
  })
  .superRefine((s, ctx) => {
    if (s.ctrTyp !== undefined && s.ctrTyp < s.ctrMin)
      ctx.addIssue({ code: 'custom', path: ['ctrTyp'], message: 'typical CTR must be at least ctrMin' })
    const passiveIsRise = (s.wiring ?? 'collector') === 'collector'
    const pointLed = s.ctrTestCurrent ?? POINT_DEFAULT_LED_CURRENT
    s.characterization.forEach((p, i) => {
      // the slow (passive) edge reaches 50 % no sooner than ln 2 / ln 9 of its 10-90 % time
      const delay = passiveIsRise ? p.tplh : p.tphl
      const edge = passiveIsRise ? p.tr : p.tf
      const names = passiveIsRise ? ['tplh', 'tr'] : ['tphl', 'tf']
      if (delay !== undefined && edge !== undefined && delay < (edge * Math.LN2) / Math.log(9) * (1 - 1e-9))
        ctx.addIssue({
          code: 'custom',
          path: ['characterization', i, names[0]!],
          message: `${names[0]} is below the 50 % share of ${names[1]} (${names[1]} x ln 2 / ln 9): the passive edge cannot reach 50 % that early`,
        })
      for (let j = 0; j < i; j++) {
        const q = s.characterization[j]!
        const close = (a: number, b: number) => Math.abs(a - b) <= 0.01 * Math.max(Math.abs(a), Math.abs(b))
        if (
          close(p.rl, q.rl) &&
          close(p.ledCurrent ?? pointLed, q.ledCurrent ?? pointLed) &&
          close(p.loadCap ?? POINT_DEFAULT_LOAD_CAP, q.loadCap ?? POINT_DEFAULT_LOAD_CAP) &&
          close(p.vcc ?? s.vcc, q.vcc ?? s.vcc) &&
          (p.rbe === undefined) === (q.rbe === undefined) &&
          (p.rbe === undefined || close(p.rbe, q.rbe!))
        )
          ctx.addIssue({
            code: 'custom',
            path: ['characterization', i, 'rl'],
            message: `points ${j + 1} and ${i + 1} were taken at the same conditions (RL, LED current, load within 1 %): merge them into one point`,
          })
      }
    })
    // a base-emitter resistor that takes more than the typical photocurrent leaves the output off for good
    if (s.rbe !== undefined) {
      const available = ctrTypOf(s) * ledCurrentOf(s)
      const diverted = rbeDivertedCurrent(s.rbe, s.hfe, VBE_HIGH)
      if (available > 0 && diverted >= available)
        ctx.addIssue({
          code: 'custom',
          path: ['rbe'],
          message: `rbe diverts hFE x VBE / rbe = ${(diverted * 1e3).toPrecision(3)} mA of collector current, more than the ${(available * 1e3).toPrecision(3)} mA the typical CTR gives: the output never switches; raise rbe`,
        })
    }
  })
export type PhototransistorStage = z.infer<typeof PhototransistorStage>

export const WireStage = z.object({
  kind: z.literal('wire'),
  ...stageCommon,
  /** metres */
  length: num(0, 10000, 'length (m)'),
  /** seconds per metre (5 ns/m: velocity factor about 0.66) */
  delayPerMeter: num(1e-10, 1e-6, 'delay per metre (s/m)').default(5e-9),
})
export type WireStage = z.infer<typeof WireStage>

export const RcStage = z.object({
  kind: z.literal('rc'),
  ...stageCommon,
  r: Ohms,
  c: Farads,
  /** which output direction is passive (charged through R) */
  passive: z.enum(['rise', 'fall']).default('rise'),
})
export type RcStage = z.infer<typeof RcStage>

/**
 * A bus transceiver (CAN, RS-485 / RS-422): its driver (TXD to the bus) and receiver (the bus to
 * RXD) propagation delays and skew. In a `txd` channel it contributes its driver delay, in an
 * `rxd` channel its receiver delay, in a `de` channel nothing (its enable and disable times are
 * used instead), and in any other channel (a UART across an RS-485 bus) driver and receiver in turn.
 */
export const TransceiverStage = z
  .object({
    kind: z.literal('transceiver'),
    ...stageCommon,
    /** driver propagation delay, TXD (or DI) to the bus, seconds */
    driverDelay: DelaySpec,
    /** receiver propagation delay, the bus to RXD (or RO), seconds */
    receiverDelay: DelaySpec,
    /** |tPLH - tPHL| of driver and receiver each (datasheet "skew" or pulse skew), seconds */
    skew: Seconds.default(0),
    /** loop delay TXD -> bus -> RXD the datasheet guarantees (max), seconds; bounds driver + receiver when given */
    loopDelayMax: Seconds.optional(),
    /** driver enable time (DE asserted to the bus driven, tZH / tZL max), seconds */
    enableTime: Seconds.optional(),
    /** driver disable time (DE released to the bus released, tHZ / tLZ min), seconds */
    disableTime: Seconds.optional(),
  })
  .refine((t) => t.loopDelayMax === undefined || t.loopDelayMax >= t.driverDelay.min + t.receiverDelay.min, {
    message: 'loopDelayMax is below the sum of the minimum driver and receiver delays',
    path: ['loopDelayMax'],
  })
export type TransceiverStage = z.infer<typeof TransceiverStage>

export const StageSpec = z.discriminatedUnion('kind', [DigitalStage, PhototransistorStage, WireStage, RcStage, TransceiverStage])
export type StageSpec = z.infer<typeof StageSpec>
export type StageKind = StageSpec['kind']

// ---------------------------------------------------------------- channels

export const ReceiverSpec = z
  .object({
    /** receiver supply, volts */
    vdd: num(0.5, 60, 'receiver vdd (V)'),
    /** VIH (min), volts */
    vih: Volts,
    /** VIL (max), volts */
    vil: Volts,
    schmitt: z.boolean().default(false),
    /** Schmitt positive-going threshold (a value or min/max), volts */
    vtPlus: ThresholdSpec.optional(),
    /** Schmitt negative-going threshold (a value or min/max), volts */
    vtMinus: ThresholdSpec.optional(),
    /** the receiver inverts the logic level (e.g. a UART with RX inversion enabled) */
    invert: z.boolean().default(false),
    /** longest input transition the input tolerates, seconds (non-Schmitt inputs) */
    maxInputTransition: Seconds.optional(),
    /** logic-family preset the thresholds came from (informational) */
    family: cleanText(z.string().max(40), 'family').optional(),
  })
  .refine((r) => r.vil < r.vih, { message: 'vil must be below vih', path: ['vil'] })
  .refine((r) => !r.schmitt || (r.vtPlus !== undefined && r.vtMinus !== undefined), {
    message: 'a Schmitt input needs vtPlus and vtMinus',
    path: ['vtPlus'],
  })
  .refine((r) => !r.schmitt || r.vtPlus === undefined || r.vtMinus === undefined || thresholdMid(r.vtPlus) >= thresholdMid(r.vtMinus), {
    message: 'vtPlus must not lie below vtMinus (a Schmitt input switches up at the higher threshold)',
    path: ['vtPlus'],
  })
export type ReceiverSpec = z.infer<typeof ReceiverSpec>

/**
 * What a channel carries: a UART direction; SPI's clock, data and chip select; I2C's clock and
 * data through a bidirectional isolator (scl: controller to target, sda: the target's data back);
 * a CAN node's transmit and receive paths (txd, rxd); an RS-485 driver enable (de).
 */
export const ChannelRole = z.enum(['uart', 'sclk', 'mosi', 'miso', 'cs', 'scl', 'sda', 'txd', 'rxd', 'de'])
export type ChannelRole = z.infer<typeof ChannelRole>

export const ChannelSpec = z.object({
  id: z
    .string()
    .regex(/^[A-Za-z0-9_-]{1,32}$/, 'channel id: 1-32 letters, digits, - or _'),
  role: ChannelRole,
  /** free text, e.g. "board A TX -> board B RX" */
  label: cleanText(z.string().max(120), 'label').optional(),
  stages: z.array(StageSpec).max(24, 'at most 24 stages per channel'),
  receiver: ReceiverSpec,
})
export type ChannelSpec = z.infer<typeof ChannelSpec>

// ---------------------------------------------------------------- UART

const Oversampling = z.number().int('oversampling must be an integer').min(4, 'oversampling must be at least 4').max(64, 'oversampling must be at most 64')

/** Clock of one UART end: a stated error bound or a baud generator. */
const uartClockFields = {
  /** stated error bound, ppm (+-); 20000 = +-2 % */
  errorPpm: num(0, 200000, 'clock error (ppm)').optional(),
  /** peripheral clock of the baud generator, hertz */
  clockHz: num(1, 10e9, 'clock (Hz)').optional(),
  /** fractional bits of the divisor (0 = integer divisor, 4 = 1/16 steps) */
  fractionBits: z.number().int().min(0).max(8).optional(),
  /** oscillator tolerance, ppm (+-) */
  tolerancePpm: num(0, 200000, 'oscillator tolerance (ppm)').optional(),
}

const clockGiven = (c: { errorPpm?: number; clockHz?: number }) => c.errorPpm !== undefined || c.clockHz !== undefined

export const UartTxSpec = z
  .object({ ...uartClockFields, oversampling: Oversampling.optional() })
  .refine(clockGiven, { message: 'give errorPpm or a baud generator clockHz', path: ['errorPpm'] })
export type UartTxSpec = z.infer<typeof UartTxSpec>

export const UartRxSpec = z
  .object({
    ...uartClockFields,
    /** ticks: the oversampling receiver of timing-model.md section 2; ideal: exactly at samplePoint */
    sampler: z.enum(['ticks', 'ideal']).default('ticks'),
    oversampling: Oversampling.default(16),
    /** sample ticks after the detection tick, each below oversampling */
    sampleTicks: z.array(z.number().int().min(0).max(63)).min(1).max(15).optional(),
    vote: z.enum(['single', 'majority', 'all']).default('majority'),
    /** ideal sampler: fraction of the bit at which it samples */
    samplePoint: num(0.01, 0.99, 'sample point').default(0.5),
  })
  .refine(clockGiven, { message: 'give errorPpm or a baud generator clockHz', path: ['errorPpm'] })
  .superRefine((rx, ctx) => {
    if (rx.sampler !== 'ticks' || !rx.sampleTicks) return
    const ticks = rx.sampleTicks
    if (ticks.some((t) => t >= rx.oversampling))
      ctx.addIssue({ code: 'custom', path: ['sampleTicks'], message: 'every sample tick must be below oversampling' })
    for (let i = 1; i < ticks.length; i++)
      if (ticks[i]! <= ticks[i - 1]!)
        ctx.addIssue({ code: 'custom', path: ['sampleTicks'], message: 'sample ticks must be strictly increasing' })
    if (rx.vote === 'single' && ticks.length !== 1)
      ctx.addIssue({ code: 'custom', path: ['sampleTicks'], message: "vote 'single' takes exactly one tick" })
    if (rx.vote === 'majority' && (ticks.length < 3 || ticks.length % 2 === 0))
      ctx.addIssue({ code: 'custom', path: ['sampleTicks'], message: "vote 'majority' takes an odd number of at least three ticks" })
  })
export type UartRxSpec = z.infer<typeof UartRxSpec>

export const UartSettings = z.object({
  baud: num(1, 100e6, 'baud'),
  dataBits: z.number().int().min(5, 'dataBits must be 5 to 9').max(9, 'dataBits must be 5 to 9'),
  parity: z.enum(['none', 'even', 'odd', 'mark', 'space']).default('none'),
  stopBits: z.union([z.literal(1), z.literal(1.5), z.literal(2)], { error: 'stopBits must be 1, 1.5 or 2' }),
  backToBack: z.boolean().default(true),
  /** required margin, unit intervals */
  requiredMarginUi: num(0, 0.5, 'required margin (UI)').default(0.1),
  /** bit error ratio target for the statistical view */
  berTarget: num(1e-20, 0.1, 'BER target').default(1e-12),
  tx: UartTxSpec,
  rx: UartRxSpec,
})
export type UartSettings = z.infer<typeof UartSettings>

// ---------------------------------------------------------------- SPI

export const SpiController = z.object({
  /** controller MISO setup requirement, seconds */
  misoSetup: Seconds.default(0),
  /** controller MISO hold requirement, seconds */
  misoHold: Seconds.default(0),
  /** sample MISO one half-cycle later than the standard edge */
  delayedSampling: z.boolean().default(false),
  /** time the controller gives from CS asserted to the first SCLK edge (default half a period) */
  csLeadTime: Seconds.optional(),
  /** time the controller gives from the last SCLK edge to CS released (default half a period) */
  csLagTime: Seconds.optional(),
  /** controller clock feeding the SCLK prescaler, hertz */
  clockHz: num(1, 10e9, 'controller clock (Hz)').optional(),
  /** prescaler divisors available (default 2, 4, 8 ... 256) */
  prescalers: z.array(z.number().int().min(1).max(65536)).min(1).max(64).optional(),
})
export type SpiController = z.infer<typeof SpiController>

export const SpiPeripheral = z.object({
  mosiSetup: Seconds.default(0),
  mosiHold: Seconds.default(0),
  /** clock-to-output from the SCLK edge it sees to MISO valid, seconds */
  clockToOut: TimeRange,
  sclkHighMin: Seconds.default(0),
  sclkLowMin: Seconds.default(0),
  /** CS asserted to first SCLK edge, minimum, seconds */
  csLead: Seconds.default(0),
  /** last SCLK edge to CS released, minimum, seconds */
  csLag: Seconds.default(0),
})
export type SpiPeripheral = z.infer<typeof SpiPeripheral>

export const IsolatorPackage = z.object({
  /** ids of channels through one isolator package */
  channels: z.array(z.string()).min(1),
  /** channel-to-channel skew bound within the package, seconds */
  channelSkew: Seconds,
})
export type IsolatorPackage = z.infer<typeof IsolatorPackage>

const spiFlatKeys = {
  controller: ['misoSetup', 'misoHold', 'delayedSampling', 'csLeadTime', 'csLagTime', 'clockHz', 'prescalers'],
  peripheral: ['mosiSetup', 'mosiHold', 'clockToOut', 'sclkHighMin', 'sclkLowMin', 'csLead', 'csLag'],
} as const

/**
 * Accept the controller and peripheral timing either nested (`controller`, `peripheral`,
 * the canonical form) or flat on the SPI settings, as the issue lists them.
 */
function nestSpiTiming(input: unknown): unknown {
  if (!input || typeof input !== 'object' || Array.isArray(input)) return input
  const src = input as Record<string, unknown>
  const out: Record<string, unknown> = { ...src }
  for (const group of ['controller', 'peripheral'] as const) {
    const nested = src[group] && typeof src[group] === 'object' ? { ...(src[group] as object) } : {}
    for (const key of spiFlatKeys[group]) {
      if (key in src) {
        ;(nested as Record<string, unknown>)[key] ??= src[key]
        delete out[key]
      }
    }
    out[group] = nested
  }
  return out
}

export const SpiSettings = z.preprocess(
  nestSpiTiming,
  z.object({
    sclkHz: num(1, 1e9, 'SCLK (Hz)'),
    cpol: z.union([z.literal(0), z.literal(1)]),
    cpha: z.union([z.literal(0), z.literal(1)]),
    /** slack every check must keep, seconds */
    requiredSlack: Seconds.default(0),
    /**
     * slack the checks that scale with the clock must keep, as a fraction of the half period
     * (a team's policy, e.g. 0.1); each such check needs the larger of this and requiredSlack
     */
    requiredSlackFraction: num(0, 0.9, 'required slack fraction').optional(),
    controller: SpiController,
    peripheral: SpiPeripheral,
    packages: z.array(IsolatorPackage).max(16).default([]),
  }),
)
export type SpiSettings = z.infer<typeof SpiSettings>

// ---------------------------------------------------------------- link

// ---------------------------------------------------------------- I2C (timing-model.md section 4)

/** One side of an isolated I2C bus: its supply, pull-up, bus capacitance and its devices' levels. */
export const I2cSideSpec = z.object({
  /** supply of this side's pull-ups, volts */
  vdd: num(0.8, 60, 'supply vdd (V)'),
  /** pull-up resistor, ohms */
  rp: Ohms,
  /** bus capacitance of the line on this side, farads */
  cb: num(1e-13, 1e-8, 'bus capacitance (F)'),
  /** highest low level a driver on this side leaves at the mode's sink current, volts (default 0.4 V, 0.2 VDD at 2 V or less) */
  vol: PositiveVolts.optional(),
  /** lowest VIL of the devices on this side, volts (default 0.3 VDD) */
  vil: PositiveVolts.optional(),
})
export type I2cSideSpec = z.infer<typeof I2cSideSpec>

export const I2cSettings = z
  .object({
    mode: z.enum(['standard', 'fast', 'fast-plus'], { error: "mode must be 'standard', 'fast' or 'fast-plus'" }),
    /** the controller's SCL frequency, hertz */
    sclHz: num(100, 5e6, 'SCL frequency (Hz)'),
    /** the controller's SCL low time as a fraction of its period (default the mode's tLOW / (tLOW + tHIGH)) */
    dutyLow: num(0.05, 0.95, 'SCL low fraction').optional(),
    /** slack every timing check must keep, seconds */
    requiredSlack: Seconds.default(0),
    /** side a: the controller's */
    controller: I2cSideSpec.extend({
      /** the controller's data hold after its own SCL falling edge, seconds (UM10204: 0 s minimum) */
      tHdDat: Seconds.default(0),
    }),
    /** side b: the target's */
    target: I2cSideSpec.extend({
      /** the target's data valid time after SCL low, seconds (default the mode's tVD;DAT max) */
      tVdDat: Seconds.optional(),
    }),
    /** the bidirectional isolator between the sides */
    isolator: z
      .object({
        /** static low-level offset the isolator puts on one side (it tells its own low from the bus's), volts */
        lowOffset: PositiveVolts.optional(),
        offsetSide: z.enum(['controller', 'target']).default('controller'),
        /** the isolator's input threshold as a fraction of its side's VDD (default 0.5) */
        threshold: num(0.1, 0.9, 'isolator threshold (fraction of VDD)').optional(),
      })
      .default({ offsetSide: 'controller' }),
  })
  .superRefine((s, ctx) => {
    for (const side of ['controller', 'target'] as const) {
      const v = s[side]
      if (v.vol !== undefined && v.vol >= v.vdd) ctx.addIssue({ code: 'custom', path: [side, 'vol'], message: 'vol must be below the side\'s vdd' })
      if (v.vil !== undefined && v.vil >= v.vdd) ctx.addIssue({ code: 'custom', path: [side, 'vil'], message: 'vil must be below the side\'s vdd' })
    }
  })
export type I2cSettings = z.infer<typeof I2cSettings>

// ---------------------------------------------------------------- CAN (timing-model.md section 4)

/** A bit-timing setting of the controller, in time quanta (ISO 11898-1). */
/** A whole count of time quanta (or the prescaler) from 1 to `max`, its message naming the field. */
const wholeCount = (name: string, max: number) =>
  z.number().int(`${name} must be a whole number`).min(1, `${name} must be at least 1`).max(max, `${name} must be at most ${max}`)

export const CanTimingSpec = z.object({
  brp: wholeCount('brp', 1024),
  propSeg: wholeCount('propSeg', 64),
  phaseSeg1: wholeCount('phaseSeg1', 64),
  phaseSeg2: wholeCount('phaseSeg2', 64),
  sjw: wholeCount('sjw', 64),
})
export type CanTimingSpec = z.infer<typeof CanTimingSpec>

/** A sample point: a fraction of the bit, strictly inside it. */
const SamplePoint = z
  .number({ error: 'sample point must be a number' })
  .gt(0.5, 'sample point must lie in the second half of the bit (above 0.5)')
  .lt(1, 'sample point must lie inside the bit (below 1)')

export const CanSettings = z
  .object({
    /** nominal (arbitration) bit rate, bit/s */
    bitRate: num(1000, 1e6, 'bit rate (bit/s)'),
    /** the CAN controller's clock, hertz */
    clockHz: num(1e5, 1e9, 'CAN clock (Hz)'),
    /** wanted sample point of the nominal bit (CiA 301 recommends 0.875) */
    samplePoint: SamplePoint.default(0.875),
    /** the setting the firmware uses (optional: without it the best setting of the table is taken) */
    timing: CanTimingSpec.optional(),
    /** bus length between the two most distant nodes, metres */
    busLength: num(0, 10000, 'bus length (m)'),
    /** signal delay of the bus cable, seconds per metre */
    delayPerMetre: num(1e-9, 1e-7, 'delay per metre (s/m)').default(5e-9),
    /** oscillator tolerance of the nodes' clocks, as a fraction (0.001 = 0.1 %); checked against the setting's */
    clockTolerance: num(0, 0.02, 'clock tolerance (fraction)').optional(),
    /** the most distant other node's paths (default: the same as this node's) */
    farNode: z.object({ outputDelay: Seconds, inputDelay: Seconds }).optional(),
    /** CAN FD data phase */
    fd: z
      .object({
        dataBitRate: num(1e5, 20e6, 'data bit rate (bit/s)'),
        dataSamplePoint: SamplePoint.default(0.75),
        /** transmitter delay compensation on */
        tdc: z.boolean().default(true),
      })
      .optional(),
  })
  .superRefine((s, ctx) => {
    if (s.fd && s.fd.dataBitRate < s.bitRate) ctx.addIssue({ code: 'custom', path: ['fd', 'dataBitRate'], message: 'the data bit rate must be at least the nominal bit rate' })
    if (s.timing) {
      const t = s.timing
      if (t.sjw > Math.min(t.phaseSeg1, t.phaseSeg2)) ctx.addIssue({ code: 'custom', path: ['timing', 'sjw'], message: 'sjw must not exceed either phase segment' })
      const bit = 1 + t.propSeg + t.phaseSeg1 + t.phaseSeg2
      const rate = s.clockHz / (t.brp * bit)
      if (Math.abs(rate - s.bitRate) > 1e-6 * s.bitRate)
        ctx.addIssue({ code: 'custom', path: ['timing', 'brp'], message: `this timing gives ${rate.toPrecision(6)} bit/s from the ${s.clockHz} Hz clock, not the bit rate ${s.bitRate} bit/s (clock / (brp x (1 + propSeg + phaseSeg1 + phaseSeg2)))` })
    }
  })
export type CanSettings = z.infer<typeof CanSettings>

// ---------------------------------------------------------------- RS-485 (timing-model.md section 4)

export const Rs485Settings = z.object({
  /** half duplex: one pair, the driver enabled per frame (needs a 'de' channel); full: two pairs (RS-422 style) */
  duplex: z.enum(['half', 'full']).default('half'),
  /** firmware: DE asserted this long before the start bit leaves TX, seconds */
  leadTime: Seconds.default(0),
  /** firmware: DE released this long after the end of the last stop bit at TX (negative: early), seconds */
  lagTime: SignedSeconds.default(0),
})
export type Rs485Settings = z.infer<typeof Rs485Settings>

// ---------------------------------------------------------------- link

/** Protocols the engine analyses: each with its own settings key (uart, spi, i2c, can; rs485 = uart + rs485). */
export const Protocol = z.enum(['uart', 'spi', 'i2c', 'can', 'rs485'])
export type Protocol = z.infer<typeof Protocol>

export const LinkSpec = z
  .object({
    schemaVersion: z.union([z.literal(1), z.literal(LINK_SCHEMA_VERSION)], { error: `schemaVersion must be ${LINK_SCHEMA_VERSION} (or 1, read as it is)` }),
    name: cleanText(z.string().trim().min(1, 'name is required').max(200, 'name is at most 200 characters'), 'name'),
    protocol: Protocol,
    description: cleanText(z.string().max(4000), 'description').optional(),
    channels: z.array(ChannelSpec).min(1, 'a link needs at least one channel').max(16, 'at most 16 channels'),
    uart: UartSettings.optional(),
    spi: SpiSettings.optional(),
    i2c: I2cSettings.optional(),
    can: CanSettings.optional(),
    rs485: Rs485Settings.optional(),
  })
  .superRefine((link, ctx) => {
    const ids = new Set<string>()
    link.channels.forEach((ch, i) => {
      if (ids.has(ch.id)) ctx.addIssue({ code: 'custom', path: ['channels', i, 'id'], message: `duplicate channel id '${ch.id}'` })
      ids.add(ch.id)
    })
    const roles = link.channels.map((c) => c.role)
    const only = (allowed: readonly string[], what: string) =>
      link.channels.forEach((ch, i) => {
        if (!allowed.includes(ch.role)) ctx.addIssue({ code: 'custom', path: ['channels', i, 'role'], message: `${what} channels have role ${allowed.map((r) => `'${r}'`).join(' or ')}` })
      })
    const count = (role: string) => roles.filter((r) => r === role).length
    const exactly = (role: string, what: string) => {
      if (count(role) !== 1) ctx.addIssue({ code: 'custom', path: ['channels'], message: `${what} needs exactly one '${role}' channel` })
    }
    if (link.protocol === 'uart' || link.protocol === 'rs485') {
      const what = link.protocol === 'uart' ? 'a UART link' : 'an RS-485 link'
      if (!link.uart) ctx.addIssue({ code: 'custom', path: ['uart'], message: `${what} needs uart settings` })
      const n = count('uart')
      if (n < 1 || n > 2) ctx.addIssue({ code: 'custom', path: ['channels'], message: `${what} has one or two uart channels (one per direction)` })
      if (link.protocol === 'uart') only(['uart'], "a UART link's")
      else {
        only(['uart', 'de'], "an RS-485 link's")
        if (!link.rs485) ctx.addIssue({ code: 'custom', path: ['rs485'], message: 'an RS-485 link needs rs485 settings' })
        const half = (link.rs485?.duplex ?? 'half') === 'half'
        if (half) exactly('de', 'a half-duplex RS-485 link')
        else if (count('de') > 0) ctx.addIssue({ code: 'custom', path: ['channels'], message: "a full-duplex RS-485 link has no 'de' channel (its drivers stay on)" })
        link.channels.forEach((ch, i) => {
          if (ch.role === 'de') {
            const j = ch.stages.findIndex((s) => s.kind === 'transceiver')
            const t = ch.stages[j]
            if (!t || t.kind !== 'transceiver') ctx.addIssue({ code: 'custom', path: ['channels', i, 'stages'], message: "the 'de' channel ends at a transceiver stage (its enable and disable times)" })
            else
              for (const k of ['enableTime', 'disableTime'] as const)
                if (t[k] === undefined) ctx.addIssue({ code: 'custom', path: ['channels', i, 'stages', j, k], message: `${k}: the driver-enable channel's transceiver needs its ${k === 'enableTime' ? 'enable time (tZH / tZL max)' : 'disable time (tHZ / tLZ min)'}` })
          }
          if (ch.role === 'uart' && !ch.stages.some((s) => s.kind === 'transceiver'))
            ctx.addIssue({ code: 'custom', path: ['channels', i, 'stages'], message: 'an RS-485 data channel passes through a transceiver stage' })
        })
      }
    }
    if (link.protocol === 'i2c') {
      if (!link.i2c) ctx.addIssue({ code: 'custom', path: ['i2c'], message: 'an I2C link needs i2c settings' })
      exactly('scl', 'an I2C link')
      exactly('sda', 'an I2C link')
      only(['scl', 'sda'], "an I2C link's")
    }
    if (link.protocol === 'can') {
      if (!link.can) ctx.addIssue({ code: 'custom', path: ['can'], message: 'a CAN link needs can settings' })
      exactly('txd', 'a CAN link')
      exactly('rxd', 'a CAN link')
      only(['txd', 'rxd'], "a CAN link's")
      link.channels.forEach((ch, i) => {
        if (!ch.stages.some((s) => s.kind === 'transceiver'))
          ctx.addIssue({ code: 'custom', path: ['channels', i, 'stages'], message: "a CAN node's txd and rxd channels pass through its transceiver stage" })
      })
    }
    if (link.protocol === 'spi') {
      if (!link.spi) ctx.addIssue({ code: 'custom', path: ['spi'], message: 'an SPI link needs spi settings' })
      for (const need of ['sclk', 'mosi', 'miso'] as const)
        if (roles.filter((r) => r === need).length !== 1)
          ctx.addIssue({ code: 'custom', path: ['channels'], message: `an SPI link needs exactly one '${need}' channel` })
      if (roles.filter((r) => r === 'cs').length > 1)
        ctx.addIssue({ code: 'custom', path: ['channels'], message: "an SPI link has at most one 'cs' channel" })
      only(['sclk', 'mosi', 'miso', 'cs'], "an SPI link's")
      link.spi?.packages.forEach((p, i) =>
        p.channels.forEach((id, j) => {
          if (!ids.has(id)) ctx.addIssue({ code: 'custom', path: ['spi', 'packages', i, 'channels', j], message: `unknown channel '${id}'` })
        }),
      )
    }
  })

/** The validated link (defaults filled in). */
export type Link = z.infer<typeof LinkSpec>
/** What a caller may send (defaults optional). */
export type LinkInput = z.input<typeof LinkSpec>
