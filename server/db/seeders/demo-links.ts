/**
 * The demo scenario's links and the built-in part library (product.md). Every name and
 * number here is invented demo data with class-typical values; none describes a real part.
 */
import type { LinkInput } from '../../../shared/schemas/link'
import { RECEIVER_PRESETS } from '../../../shared/utils/receiver-presets'
import { BUILT_IN_PARTS, DIS4, LOC10, PTC20 } from '../../../shared/parts/generic'

const lvcmos33 = RECEIVER_PRESETS[0]
const mcuSchmitt33 = RECEIVER_PRESETS.find((r) => r.family === 'Schmitt MCU 3.3 V')!

export { BUILT_IN_PARTS, DIS4, LOC10, PTC20 }

/**
 * Gate-driver board telemetry to the display controller: fails at its specified 38400 baud
 * with the 4.7 kOhm pull-up; no pull-up and LED resistor within the coupler's ratings makes
 * it pass (its slow edge is dominated by storage), and the sweep says which speed-up does.
 */
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
      receiver: { ...mcuSchmitt33, invert: true },
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
