/**
 * Phototransistor coupler rules shared by the link schema (validation), the engine and
 * the stage form: the LED drive, the typical-CTR and gain defaults, and the current a
 * base-emitter resistor diverts. Pure functions, SI units.
 */

/**
 * Base-emitter voltage of a conducting output transistor, volts: somewhere in
 * [VBE_LOW, VBE_HIGH] (it falls with the collector current). Each use takes the end that
 * predicts the slower or weaker output: R_BE diverts hFE x VBE / R_BE of collector
 * current, so the static saturation check and the turn-on take VBE_HIGH; the storage
 * delay and the rise, which diverted current shortens, take VBE_LOW.
 */
export const VBE_LOW = 0.5 // common practice: small-signal silicon transistor near cut-off
export const VBE_HIGH = 0.7 // common practice: small-signal silicon transistor in saturation

/** Typical CTR assumed, as a multiple of ctrMin, when a stage does not state ctrTyp. */
export const CTR_TYP_MULTIPLE = 3.75
/**
 * Without a stated ctrTyp the engine also calibrates at these multiples of ctrMin and
 * widens the corners to cover every one (the predictions away from the points depend on
 * the typical overdrive).
 */
export const CTR_TYP_BRACKET = [2.5, 5] as const

/** Current gain assumed for the output transistor when a stage gives R_BE without hfe. */
export const DEFAULT_HFE = 500

/** LED current of a characterisation point that does not state its own, amperes (when the stage gives no CTR test current). */
export const POINT_DEFAULT_LED_CURRENT = 10e-3
/** Load capacitance of a characterisation point that does not state its own, farads: an unloaded datasheet test. */
export const POINT_DEFAULT_LOAD_CAP = 0

/** How the LED is driven: straight from a logic pin, or through a transistor switch. */
export type LedDriver = 'pin' | 'transistor'

/** The drive's own output drop (V_OL or V_OH at the drive current) and current limit, by driver kind. */
export const DRIVER_DEFAULTS: Record<LedDriver, { drop: number; currentMax: number | null }> = {
  // common practice: a general-purpose microcontroller pin, V_OL about 0.4 V near 8-10 mA,
  // 20 mA as the usual per-pin current limit
  pin: { drop: 0.4, currentMax: 20e-3 },
  // common practice: a small-signal transistor switch, VCE(sat) about 0.2 V; its own
  // rating (about 100 mA or more) is not the LED's limit
  transistor: { drop: 0.2, currentMax: null },
}

/** Logic-family presets for a pin that drives the LED: its drop at the drive current and its current limit. */
export const DRIVER_PRESETS: { id: string; label: string; driver: LedDriver; drop: number; currentMax: number | null }[] = [
  // common practice: 3.3 V microcontroller GPIO, V_OL 0.4 V at 8 mA, 20 mA per pin
  { id: 'mcu-3v3', label: '3.3 V microcontroller pin', driver: 'pin', drop: 0.4, currentMax: 20e-3 },
  // common practice: 5 V microcontroller GPIO, V_OL 0.6 V at 20 mA, 20 mA recommended per pin
  { id: 'mcu-5v', label: '5 V microcontroller pin', driver: 'pin', drop: 0.6, currentMax: 20e-3 },
  // common practice: 74LVC-class buffer output, V_OL 0.55 V at 24 mA
  { id: 'lvc-buffer', label: 'LVC buffer output (24 mA)', driver: 'pin', drop: 0.55, currentMax: 24e-3 },
  // common practice: small-signal NPN switch in saturation
  { id: 'transistor', label: 'Transistor switch', driver: 'transistor', drop: 0.2, currentMax: null },
]

export interface LedDriveFields {
  driveVoltage: number
  vf: number
  rLed?: number
  ledCurrent?: number
  driver?: LedDriver
  driverDrop?: number
}

/** The drive's output drop, volts: the stage's own value or its driver kind's default. */
export function driverDropOf(s: Pick<LedDriveFields, 'driver' | 'driverDrop'>): number {
  return s.driverDrop ?? DRIVER_DEFAULTS[s.driver ?? 'pin'].drop
}

/** The drive's current limit, amperes: the stage's own value, else its driver kind's default (null: none). */
export function driverCurrentMaxOf(s: { driver?: LedDriver; driverCurrentMax?: number }): number | null {
  return s.driverCurrentMax ?? DRIVER_DEFAULTS[s.driver ?? 'pin'].currentMax
}

/** LED forward current: (Vdrive - VF - V_drop) / R_LED, or the stated current, amperes (never negative). */
export function ledCurrentOf(s: LedDriveFields): number {
  if (s.rLed !== undefined) return Math.max(0, (s.driveVoltage - s.vf - driverDropOf(s)) / s.rLed)
  return Math.max(0, s.ledCurrent ?? 0)
}

/** The typical CTR used: the stage's ctrTyp, else CTR_TYP_MULTIPLE x ctrMin. */
export function ctrTypOf(s: { ctrMin: number; ctrTyp?: number }): number {
  return s.ctrTyp ?? CTR_TYP_MULTIPLE * s.ctrMin
}

/** Collector current a base-emitter resistor diverts, hFE x VBE / R_BE, amperes (0 without R_BE). */
export function rbeDivertedCurrent(rbe: number | undefined, hfe: number | undefined, vbe: number): number {
  return rbe === undefined ? 0 : ((hfe ?? DEFAULT_HFE) * vbe) / rbe
}

/** Whether a phototransistor stage inverts: collector wiring inverts, emitter does not; an LED lit by a low input flips it. */
export function phototransistorInverts(wiring: 'collector' | 'emitter', ledOnWhen: 'high' | 'low'): boolean {
  const wiringInverts = wiring !== 'emitter'
  return ledOnWhen === 'low' ? !wiringInverts : wiringInverts
}
