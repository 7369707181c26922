/**
 * The demo scenario's links and the built-in part library (product.md). Every name and
 * number here is invented demo data with class-typical values; none describes a real part.
 */
import type { LinkInput } from '../../../shared/schemas/link'
import { RECEIVER_PRESETS } from '../../../shared/utils/receiver-presets'

type StageInput = LinkInput['channels'][number]['stages'][number]

const lvcmos33 = RECEIVER_PRESETS[0]

/** Generic 20 %-CTR phototransistor coupler, collector pull-up (inverting), LED lit by a high pin. */
export const PTC20: StageInput = {
  kind: 'phototransistor',
  name: 'PTC-20 generic phototransistor coupler',
  wiring: 'collector',
  ledOnWhen: 'high',
  driveVoltage: 3.3,
  vf: 1.2,
  rLed: 430,
  ctrMin: 0.2,
  ctrTestCurrent: 0.005,
  ctrDerating: { temperature: 0.9, endOfLife: 0.85 },
  vcc: 3.3,
  rl: 4700,
  vceSat: 0.4,
  loadCap: 15e-12,
  ledCurrentMax: 0.05,
  collectorCurrentMax: 0.05,
  powerMax: 0.15,
  driverCurrentMax: 0.025,
  partSkew: 2e-6,
  characterization: [
    { rl: 1000, tplh: 5e-6, tphl: 2.0e-6, tr: 3.5e-6, tf: 1.5e-6, loadCap: 15e-12 },
    { rl: 4700, tplh: 22e-6, tphl: 3.0e-6, tr: 15e-6, tf: 2.0e-6, loadCap: 15e-12 },
    { rl: 10000, tplh: 45e-6, tphl: 4.0e-6, tr: 30e-6, tf: 2.5e-6, loadCap: 15e-12 },
  ],
}

/** Generic logic-output coupler (push-pull output, inverting). */
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
}

/** One channel of a generic four-channel digital isolator. */
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

/** The built-in part library: generic parameter sets for common stage classes. */
export const BUILT_IN_PARTS: { name: string; category: string; description: string; stage: StageInput }[] = [
  { name: PTC20.name, category: 'phototransistor coupler', description: 'Slow, asymmetric edges; timing depends strongly on the pull-up. CTR 20 % min at 5 mA.', stage: PTC20 },
  { name: LOC10.name, category: 'logic-output coupler', description: 'Push-pull output, up to about 1 Mbit/s; PWD 35 ns max.', stage: LOC10 },
  { name: DIS4.name, category: 'digital isolator', description: 'Four channels in one package; 15 ns max delay, 3 ns PWD.', stage: DIS4 },
  { name: BUF1.name, category: 'buffer', description: 'Generic single CMOS buffer.', stage: BUF1 },
  { name: CABLE1M.name, category: 'cable', description: 'Delay only: 5 ns per metre.', stage: CABLE1M },
]

/** Gate-driver board telemetry to the display controller: fails at 38400 baud with the 4.7 kOhm pull-up. */
export const TELEMETRY_LINK: LinkInput = {
  schemaVersion: 1,
  name: 'Gate-driver telemetry UART',
  protocol: 'uart',
  description: 'Gate-driver board MCU TX to the display controller RX through the PTC-20 coupler (collector pull-up, output inverts; the display controller inverts RX).',
  channels: [
    {
      id: 'telemetry',
      role: 'uart',
      label: 'gate driver TX -> display RX',
      stages: [PTC20],
      receiver: { ...lvcmos33, invert: true, maxInputTransition: 50e-6 },
    },
  ],
  uart: {
    baud: 38400,
    dataBits: 8,
    parity: 'none',
    stopBits: 1,
    backToBack: true,
    requiredMarginUi: 0.1,
    berTarget: 1e-12,
    tx: { clockHz: 16e6, oversampling: 16, fractionBits: 4, tolerancePpm: 10000 },
    rx: { clockHz: 48e6, oversampling: 16, fractionBits: 4, tolerancePpm: 100, sampleTicks: [7, 8, 9], vote: 'majority' },
  },
}

const spiChannel = (id: string, role: 'sclk' | 'mosi' | 'miso' | 'cs', label: string) => ({
  id,
  role,
  label,
  stages: [{ ...DIS4 }],
  receiver: { ...lvcmos33 },
})

/** Isolated SPI to the current-sense ADC through one four-channel digital isolator. */
export const ADC_SPI_LINK: LinkInput = {
  schemaVersion: 1,
  name: 'Current-sense ADC SPI',
  protocol: 'spi',
  description: 'Control MCU to the isolated current-sense ADC; SCLK, MOSI, CS forward and MISO back through one DIS-4 package.',
  channels: [
    spiChannel('sclk', 'sclk', 'MCU SCLK -> ADC'),
    spiChannel('mosi', 'mosi', 'MCU MOSI -> ADC'),
    spiChannel('miso', 'miso', 'ADC DOUT -> MCU MISO'),
    spiChannel('cs', 'cs', 'MCU CS -> ADC'),
  ],
  spi: {
    sclkHz: 8e6,
    cpol: 0,
    cpha: 1,
    requiredSlack: 5e-9,
    controller: { misoSetup: 5e-9, misoHold: 2e-9, delayedSampling: false, clockHz: 64e6, prescalers: [2, 4, 8, 16, 32, 64, 128, 256] },
    peripheral: { mosiSetup: 5e-9, mosiHold: 5e-9, clockToOut: { min: 2e-9, max: 12e-9 }, sclkHighMin: 20e-9, sclkLowMin: 20e-9, csLead: 10e-9, csLag: 10e-9 },
    packages: [{ channels: ['sclk', 'mosi', 'miso', 'cs'], channelSkew: 2e-9 }],
  },
}

/** Debug console through the logic-output coupler, both directions. */
export const DEBUG_LINK: LinkInput = {
  schemaVersion: 1,
  name: 'Debug console UART',
  protocol: 'uart',
  description: 'Service header on the gate-driver board to the bench adapter, one LOC-10 per direction; each inverting coupler is followed by an inverting receiver setting.',
  channels: [
    { id: 'debug-tx', role: 'uart', label: 'gate driver TX -> adapter RX', stages: [LOC10], receiver: { ...lvcmos33, invert: true } },
    { id: 'debug-rx', role: 'uart', label: 'adapter TX -> gate driver RX', stages: [LOC10], receiver: { ...lvcmos33, invert: true } },
  ],
  uart: {
    baud: 115200,
    dataBits: 8,
    parity: 'none',
    stopBits: 1,
    backToBack: true,
    requiredMarginUi: 0.1,
    berTarget: 1e-12,
    tx: { clockHz: 16e6, oversampling: 16, fractionBits: 4, tolerancePpm: 10000 },
    rx: { errorPpm: 5000, oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
  },
}

export const DEMO_PROJECT = {
  name: 'PX-7 pump inverter',
  description: 'Solar pump inverter: gate-driver board, control board and display controller.',
  links: [TELEMETRY_LINK, ADC_SPI_LINK, DEBUG_LINK],
}
