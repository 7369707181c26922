/**
 * Generic class parameter sets: one per stage class a team meets, with invented names and
 * values typical of the class (each states where its typical values come from). They seed
 * the built-in part library and give the pull-up sweep's advice its alternatives. None
 * describes a real part: every description says to replace the values with the datasheet's.
 */
import type { LinkInput } from '../schemas/link'

type StageInput = LinkInput['channels'][number]['stages'][number]

/** Said by every generic part: it is a class, not a part. */
export const GENERIC_NOTE = "Generic: replace with your part's datasheet values."

export interface GenericPart {
  name: string
  category: string
  /** what the class is, where its typical values come from, and the replace-me note */
  description: string
  stage: StageInput
}

/**
 * Generic 20 %-CTR phototransistor coupler, collector pull-up (inverting). Its points are
 * the transistor-level reference of bench/coupler.cir at 5 V (the class's common-practice
 * bench values: tPLH about 25 us, tPHL about 2 us at 4.7 kOhm, 10 mA).
 */
export const PTC20: StageInput = {
  kind: 'phototransistor',
  name: 'PTC-20 generic phototransistor coupler',
  wiring: 'collector',
  ledOnWhen: 'high',
  driveVoltage: 3.3,
  vf: 1.2,
  rLed: 160,
  driver: 'pin',
  ctrMin: 0.2,
  ctrTyp: 0.75,
  ctrTestCurrent: 0.01,
  ctrDerating: { temperature: 0.9, endOfLife: 0.85 },
  vcc: 3.3,
  rl: 4700,
  vceSat: 0.4,
  loadCap: 15e-12,
  ledCurrentMax: 0.05,
  collectorCurrentMax: 0.05,
  powerMax: 0.15,
  partSkew: 2e-6,
  characterization: [
    { rl: 1000, ledCurrent: 0.01, loadCap: 0, vcc: 5, tplh: 8.6e-6, tphl: 2.85e-6, tr: 5.5e-6, tf: 4.14e-6 },
    { rl: 1000, ledCurrent: 0.02, loadCap: 0, vcc: 5, tplh: 14.5e-6, tphl: 1.74e-6, tr: 3.8e-6, tf: 1.98e-6 },
    { rl: 2200, ledCurrent: 0.01, loadCap: 0, vcc: 5, tplh: 16.7e-6, tphl: 2.34e-6, tr: 7.1e-6, tf: 2.53e-6 },
    { rl: 2200, ledCurrent: 0.02, loadCap: 0, vcc: 5, tplh: 22.2e-6, tphl: 1.55e-6, tr: 6.7e-6, tf: 1.52e-6 },
    { rl: 4700, ledCurrent: 0.01, loadCap: 0, vcc: 5, tplh: 25.5e-6, tphl: 2.17e-6, tr: 13.5e-6, tf: 2.14e-6 },
    { rl: 4700, ledCurrent: 0.02, loadCap: 0, vcc: 5, tplh: 30.7e-6, tphl: 1.47e-6, tr: 13.4e-6, tf: 1.38e-6 },
    { rl: 10000, ledCurrent: 0.01, loadCap: 0, vcc: 5, tplh: 37e-6, tphl: 2.09e-6, tr: 28.1e-6, tf: 2.0e-6 },
    { rl: 10000, ledCurrent: 0.02, loadCap: 0, vcc: 5, tplh: 42.1e-6, tphl: 1.43e-6, tr: 28.1e-6, tf: 1.32e-6 },
  ],
}

/** Generic high-CTR phototransistor coupler (100 % minimum), values from memory of the class's datasheet curves. */
export const PTC100: StageInput = {
  kind: 'phototransistor',
  name: 'PTC-100 generic high-CTR phototransistor coupler',
  wiring: 'collector',
  ledOnWhen: 'high',
  driveVoltage: 5,
  vf: 1.2,
  rLed: 390,
  ctrMin: 1,
  ctrTyp: 2.5,
  ctrTestCurrent: 0.005,
  vcc: 5,
  rl: 4700,
  vceSat: 0.4,
  ledCurrentMax: 0.05,
  collectorCurrentMax: 0.05,
  powerMax: 0.2,
  characterization: [
    { rl: 1000, ledCurrent: 0.01, loadCap: 0, tplh: 12e-6, tphl: 3e-6, tr: 6e-6, tf: 4e-6 },
    { rl: 4700, ledCurrent: 0.01, loadCap: 0, tplh: 35e-6, tphl: 2.5e-6, tr: 18e-6, tf: 2.5e-6 },
    { rl: 10000, ledCurrent: 0.01, loadCap: 0, tplh: 60e-6, tphl: 2.5e-6, tr: 40e-6, tf: 2.5e-6 },
  ],
}

/** Generic Darlington-output coupler (500 % minimum): very slow turn-off; values from memory of the class. */
export const PDC500: StageInput = {
  kind: 'phototransistor',
  name: 'PDC-500 generic Darlington-output coupler',
  wiring: 'collector',
  ledOnWhen: 'high',
  driveVoltage: 5,
  vf: 1.2,
  rLed: 1500,
  ctrMin: 5,
  ctrTyp: 15,
  ctrTestCurrent: 0.002,
  vcc: 5,
  rl: 4700,
  vceSat: 1,
  ledCurrentMax: 0.05,
  collectorCurrentMax: 0.1,
  powerMax: 0.2,
  characterization: [
    { rl: 1000, ledCurrent: 0.002, loadCap: 0, tplh: 60e-6, tphl: 6e-6, tr: 40e-6, tf: 5e-6 },
    { rl: 4700, ledCurrent: 0.002, loadCap: 0, tplh: 150e-6, tphl: 5e-6, tr: 120e-6, tf: 4e-6 },
  ],
}

/** Generic high-speed transistor-output coupler (separate photodiode and transistor, CTR 19 % min); from memory of the class. */
export const HSC19: StageInput = {
  kind: 'phototransistor',
  name: 'HSC-19 generic high-speed transistor-output coupler',
  wiring: 'collector',
  ledOnWhen: 'high',
  driveVoltage: 5,
  vf: 1.5,
  rLed: 180,
  ctrMin: 0.19,
  ctrTyp: 0.3,
  ctrTestCurrent: 0.016,
  vcc: 5,
  rl: 4100,
  vceSat: 0.4,
  ledCurrentMax: 0.025,
  collectorCurrentMax: 0.008,
  powerMax: 0.1,
  characterization: [
    { rl: 1900, ledCurrent: 0.016, loadCap: 15e-12, tplh: 0.45e-6, tphl: 0.3e-6, tr: 0.3e-6, tf: 0.1e-6 },
    { rl: 4100, ledCurrent: 0.016, loadCap: 15e-12, tplh: 0.6e-6, tphl: 0.25e-6, tr: 0.55e-6, tf: 0.1e-6 },
  ],
}

/** Generic logic-output coupler (push-pull output, inverting), about 1 Mbit/s class; from memory of the class. */
export const LOC10: StageInput = {
  kind: 'digital',
  name: 'LOC-10 generic logic-output coupler',
  inverting: true,
  tplh: { min: 20e-9, typ: 45e-9, max: 100e-9 },
  tphl: { min: 20e-9, typ: 40e-9, max: 100e-9 },
  pwdMax: 35e-9,
  tr: { typ: 15e-9, max: 30e-9 },
  tf: { typ: 10e-9, max: 25e-9 },
  edge: 'ramp',
  partSkew: 40e-9,
  maxDataRate: 1e6,
}

/** Generic 10 Mbit/s logic-gate-output coupler (open collector with an internal pull-up path); from memory of the class. */
export const LOC10M: StageInput = {
  kind: 'digital',
  name: 'LOC-10M generic 10 Mbit/s logic-gate-output coupler',
  inverting: true,
  tplh: { min: 20e-9, typ: 48e-9, max: 75e-9 },
  tphl: { min: 20e-9, typ: 50e-9, max: 75e-9 },
  pwdMax: 35e-9,
  tr: { typ: 40e-9, max: 60e-9 },
  tf: { typ: 10e-9, max: 20e-9 },
  edge: 'ramp',
  partSkew: 40e-9,
  maxDataRate: 10e6,
}

/** One channel of a generic four-channel digital isolator (25 Mbit/s grade); from memory of the class. */
export const DIS4: StageInput = {
  kind: 'digital',
  name: 'DIS-4 generic four-channel digital isolator',
  inverting: false,
  tplh: { min: 8e-9, typ: 11e-9, max: 15e-9 },
  tphl: { min: 8e-9, typ: 11e-9, max: 15e-9 },
  pwdMax: 3e-9,
  tr: { typ: 2e-9, max: 3e-9 },
  tf: { typ: 2e-9, max: 3e-9 },
  edge: 'ramp',
  partSkew: 6e-9,
  jitterRms: 0.1e-9,
  minPulseWidth: 40e-9,
  maxDataRate: 25e6,
  failsafe: 'high',
}

/** A slow digital isolator grade with an input glitch filter (1 Mbit/s); from memory of the class. */
export const DIS1: StageInput = {
  kind: 'digital',
  name: 'DIS-1 generic 1 Mbit/s digital isolator',
  inverting: false,
  tplh: { min: 50e-9, typ: 100e-9, max: 150e-9 },
  tphl: { min: 50e-9, typ: 100e-9, max: 150e-9 },
  pwdMax: 40e-9,
  tr: { typ: 5e-9, max: 10e-9 },
  tf: { typ: 5e-9, max: 10e-9 },
  edge: 'ramp',
  partSkew: 50e-9,
  minPulseWidth: 1e-6,
  glitchFilter: 100e-9,
  maxDataRate: 1e6,
  failsafe: 'high',
}

/** A fast digital isolator grade (150 Mbit/s); from memory of the class. */
export const DIS150: StageInput = {
  kind: 'digital',
  name: 'DIS-150 generic 150 Mbit/s digital isolator',
  inverting: false,
  tplh: { min: 5e-9, typ: 8e-9, max: 13e-9 },
  tphl: { min: 5e-9, typ: 8e-9, max: 13e-9 },
  pwdMax: 1e-9,
  tr: { typ: 1e-9, max: 2e-9 },
  tf: { typ: 1e-9, max: 2e-9 },
  edge: 'ramp',
  partSkew: 4e-9,
  jitterRms: 0.05e-9,
  minPulseWidth: 6.67e-9,
  maxDataRate: 150e6,
  failsafe: 'high',
}

/** Generic RS-485 transceiver, driver and receiver delays in one direction; from memory of the class (about 10 Mbit/s). */
export const RSX10: StageInput = {
  kind: 'digital',
  name: 'RSX-10 generic RS-485 transceiver path',
  inverting: false,
  tplh: { min: 20e-9, typ: 45e-9, max: 80e-9 },
  tphl: { min: 20e-9, typ: 45e-9, max: 80e-9 },
  pwdMax: 10e-9,
  tr: { typ: 10e-9, max: 20e-9 },
  tf: { typ: 10e-9, max: 20e-9 },
  edge: 'ramp',
  partSkew: 30e-9,
  maxDataRate: 10e6,
}

/** Generic CAN transceiver, TXD to RXD through the bus in one direction; from memory of the class (loop delay up to 255 ns, references.md 4.1). */
export const CNX5: StageInput = {
  kind: 'digital',
  name: 'CNX-5 generic CAN transceiver path',
  inverting: false,
  tplh: { min: 60e-9, typ: 120e-9, max: 255e-9 },
  tphl: { min: 60e-9, typ: 110e-9, max: 255e-9 },
  tr: { typ: 10e-9, max: 20e-9 },
  tf: { typ: 10e-9, max: 20e-9 },
  edge: 'ramp',
  partSkew: 50e-9,
  maxDataRate: 5e6,
}

/**
 * Generic isolated-bus RS-485 transceiver as a transceiver stage: driver and receiver delays, skew,
 * enable and disable times of a slew-limited class; from memory of the class.
 */
export const RTX10: StageInput = {
  kind: 'transceiver',
  name: 'RTX-10 generic RS-485 transceiver',
  driverDelay: { min: 20e-9, typ: 40e-9, max: 70e-9 },
  receiverDelay: { min: 30e-9, typ: 60e-9, max: 100e-9 },
  skew: 10e-9,
  enableTime: 2.5e-6,
  disableTime: 100e-9,
}

/** Generic CAN transceiver as a transceiver stage: loop delay up to 255 ns (references.md 4.1), split driver / receiver from memory of the class. */
export const CTX5: StageInput = {
  kind: 'transceiver',
  name: 'CTX-5 generic CAN transceiver',
  driverDelay: { min: 40e-9, typ: 70e-9, max: 110e-9 },
  receiverDelay: { min: 50e-9, typ: 90e-9, max: 145e-9 },
  skew: 20e-9,
  loopDelayMax: 255e-9,
}

/**
 * Generic bidirectional I2C isolator, one channel's delays (side to side, the same both ways); it
 * drives its side-a low with a static offset of about 0.6 V to tell its own low from the bus's. From
 * memory of the class.
 */
export const BDI2: StageInput = {
  kind: 'digital',
  name: 'BDI-2 generic bidirectional I2C isolator channel',
  inverting: false,
  tplh: { min: 40e-9, typ: 70e-9, max: 110e-9 },
  tphl: { min: 40e-9, typ: 60e-9, max: 95e-9 },
  pwdMax: 25e-9,
  edge: 'ramp',
  maxDataRate: 2e6,
}

/** Generic Schmitt-trigger buffer, 5 V TTL-input (HCT) class: thresholds of references.md 8.5 [S], CD74HCT14 at 4.5 V. */
export const SBF5: StageInput = {
  kind: 'digital',
  name: 'SBF-5 generic Schmitt buffer (5 V, TTL input)',
  inverting: false,
  tplh: { min: 5e-9, typ: 15e-9, max: 30e-9 },
  tphl: { min: 5e-9, typ: 15e-9, max: 30e-9 },
  tr: { typ: 6e-9, max: 15e-9 },
  tf: { typ: 6e-9, max: 15e-9 },
  edge: 'ramp',
  schmittInput: { vtPlus: { min: 1.2, max: 1.9 }, vtMinus: { min: 0.5, max: 1.2 } },
}

/** Generic Schmitt-trigger buffer, 3.3 V CMOS class; thresholds from memory of the class (VT+ 1.3-2.0 V, VT- 0.8-1.4 V at 3.3 V). */
export const SBF3: StageInput = {
  kind: 'digital',
  name: 'SBF-3 generic Schmitt buffer (3.3 V)',
  inverting: false,
  tplh: { min: 1e-9, typ: 4e-9, max: 8e-9 },
  tphl: { min: 1e-9, typ: 4e-9, max: 8e-9 },
  tr: { typ: 2e-9, max: 4e-9 },
  tf: { typ: 2e-9, max: 4e-9 },
  edge: 'ramp',
  schmittInput: { vtPlus: { min: 1.3, max: 2.0 }, vtMinus: { min: 0.8, max: 1.4 } },
}

/** Generic CMOS buffer, non-inverting. */
export const BUF1: StageInput = {
  kind: 'digital',
  name: 'BUF-1 generic CMOS buffer',
  inverting: false,
  tplh: { min: 1e-9, typ: 3e-9, max: 6e-9 },
  tphl: { min: 1e-9, typ: 3e-9, max: 6e-9 },
  tr: { typ: 1e-9, max: 2e-9 },
  tf: { typ: 1e-9, max: 2e-9 },
  edge: 'ramp',
}

/** One metre of board-to-board cable at 5 ns/m. */
export const CABLE1M: StageInput = { kind: 'wire', name: 'Ribbon cable, 1 m', length: 1, delayPerMeter: 5e-9 }

type DigitalInput = Extract<StageInput, { kind: 'digital' }>

/** The logic-output coupler the pull-up sweep offers in place of a phototransistor coupler. */
export const GENERIC_LOGIC_OUTPUT_COUPLER = LOC10 as DigitalInput

/** The Schmitt buffer the pull-up sweep offers after a coupler with output supply `vcc`: the 3.3 V class up to 3.6 V, else the 5 V class. */
export function schmittBufferFor(vcc: number): DigitalInput {
  return (vcc <= 3.6 ? SBF3 : SBF5) as DigitalInput
}

/** The built-in part library. */
export const BUILT_IN_PARTS: GenericPart[] = [
  {
    name: PTC20.name,
    category: 'phototransistor coupler',
    description: `Low-CTR phototransistor coupler class: CTR 20 % min (75 % typ) at 10 mA; slow, asymmetric edges that depend strongly on the pull-up and LED current. Points from the transistor-level reference of this class (common-practice bench values). ${GENERIC_NOTE}`,
    stage: PTC20,
  },
  {
    name: PTC100.name,
    category: 'phototransistor coupler',
    description: `High-CTR phototransistor coupler class: CTR 100 % min (250 % typ) at 5 mA; slower turn-off than the low-CTR class. Typical values from memory of the class's datasheet curves. ${GENERIC_NOTE}`,
    stage: PTC100,
  },
  {
    name: PDC500.name,
    category: 'Darlington coupler',
    description: `Darlington-output coupler class: CTR 500 % min at 2 mA, VCE(sat) about 1 V, turn-off of the order of 100 µs. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: PDC500,
  },
  {
    name: HSC19.name,
    category: 'high-speed transistor coupler',
    description: `High-speed transistor-output coupler class (separate photodiode and output transistor): CTR 19 % min at 16 mA, delays under a microsecond. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: HSC19,
  },
  {
    name: LOC10.name,
    category: 'logic-output coupler',
    description: `Push-pull logic-output coupler class, up to about 1 Mbit/s; PWD 35 ns max. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: LOC10,
  },
  {
    name: LOC10M.name,
    category: 'logic-output coupler',
    description: `10 Mbit/s logic-gate-output coupler class; 75 ns max delay, PWD 35 ns max. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: LOC10M,
  },
  {
    name: DIS1.name,
    category: 'digital isolator',
    description: `Slow digital isolator grade with an input glitch filter: 1 Mbit/s, 1 µs minimum pulse, output high when the input side loses supply. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: DIS1,
  },
  {
    name: DIS4.name,
    category: 'digital isolator',
    description: `Four channels in one package, 25 Mbit/s grade; 15 ns max delay, 3 ns PWD, output high without input-side supply. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: DIS4,
  },
  {
    name: DIS150.name,
    category: 'digital isolator',
    description: `Fast digital isolator grade, 150 Mbit/s; 13 ns max delay, 1 ns PWD. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: DIS150,
  },
  {
    name: RTX10.name,
    category: 'transceiver',
    description: `RS-485 transceiver class as a bus transceiver stage: driver and receiver delays, skew, and the slow enable of a slew-limited driver (2.5 µs). Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: RTX10,
  },
  {
    name: CTX5.name,
    category: 'transceiver',
    description: `CAN transceiver class as a bus transceiver stage: driver and receiver delays within a 255 ns loop delay. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: CTX5,
  },
  {
    name: BDI2.name,
    category: 'digital isolator',
    description: `Bidirectional I2C isolator class, one channel (the same delays both ways), up to Fast-mode Plus. Its side-a low sits about 0.6 V above ground. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: BDI2,
  },
  {
    name: RSX10.name,
    category: 'transceiver',
    description: `RS-485 transceiver class, driver to receiver in one direction, about 10 Mbit/s. Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: RSX10,
  },
  {
    name: CNX5.name,
    category: 'transceiver',
    description: `CAN transceiver class, TXD to RXD in one direction; loop delay up to 255 ns (references: ISO 11898 practice). Typical values from memory of the class. ${GENERIC_NOTE}`,
    stage: CNX5,
  },
  {
    name: SBF5.name,
    category: 'Schmitt buffer',
    description: `Schmitt-trigger buffer, 5 V TTL-input class: VT+ 1.2-1.9 V, VT- 0.5-1.2 V (published thresholds of the class at 4.5 V). Reads a slow coupler edge early and hands on a fast one. ${GENERIC_NOTE}`,
    stage: SBF5,
  },
  {
    name: SBF3.name,
    category: 'Schmitt buffer',
    description: `Schmitt-trigger buffer, 3.3 V CMOS class: VT+ 1.3-2.0 V, VT- 0.8-1.4 V (from memory of the class). ${GENERIC_NOTE}`,
    stage: SBF3,
  },
  { name: BUF1.name, category: 'buffer', description: `Generic single CMOS buffer. ${GENERIC_NOTE}`, stage: BUF1 },
  { name: CABLE1M.name, category: 'cable', description: 'Delay only: 5 ns per metre (a velocity factor of about 0.66).', stage: CABLE1M },
]
