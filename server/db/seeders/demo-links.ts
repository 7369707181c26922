/**
 * The demo scenario's links and the built-in part library (product.md). Every name and
 * number here is invented demo data with class-typical values; none describes a real part.
 */
import type { LinkInput } from '../../../shared/schemas/link'
import { RECEIVER_PRESETS } from '../../../shared/utils/receiver-presets'
import { BDI2, BUILT_IN_PARTS, CTX5, DIS1, DIS4, LOC10, PTC20, RTX10 } from '../../../shared/parts/generic'

const lvcmos33 = RECEIVER_PRESETS[0]
const mcuSchmitt33 = RECEIVER_PRESETS.find((r) => r.family === 'Schmitt MCU 3.3 V')!

export { BUILT_IN_PARTS, DIS4, LOC10, PTC20 }

/**
 * Gate-driver board telemetry to the display controller: fails at its specified 38400 baud
 * with the 4.7 kOhm pull-up; no pull-up and LED resistor within the coupler's ratings makes
 * it pass (its slow edge is dominated by storage), and the sweep says which speed-up does.
 */
export const TELEMETRY_LINK: LinkInput = {
  schemaVersion: 2,
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
  schemaVersion: 2,
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
  schemaVersion: 2,
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

/**
 * The control board's I2C to the power-stage temperature and current monitor, through one
 * bidirectional isolator; Fast mode at 300 kHz (the isolator's delays and the target side's rise take 400 kHz out of reach) with 2.2 kOhm pull-ups.
 */
export const MONITOR_I2C_LINK: LinkInput = {
  schemaVersion: 2,
  name: 'Power-stage monitor I2C',
  protocol: 'i2c',
  description: 'Control MCU (side a) to the power-stage temperature and current monitor (side b) through one BDI-2 bidirectional isolator.',
  channels: [
    { id: 'scl', role: 'scl', label: 'MCU SCL -> monitor SCL', stages: [{ ...BDI2 }], receiver: { ...lvcmos33 } },
    { id: 'sda', role: 'sda', label: 'monitor SDA -> MCU SDA', stages: [{ ...BDI2 }], receiver: { ...lvcmos33 } },
  ],
  i2c: {
    mode: 'fast',
    sclHz: 300e3,
    requiredSlack: 20e-9,
    controller: { vdd: 3.3, rp: 2.2e3, cb: 40e-12, tHdDat: 300e-9 },
    target: { vdd: 3.3, rp: 2.2e3, cb: 90e-12 },
    isolator: { lowOffset: 0.6, offsetSide: 'controller' },
  },
}

/** The inverter's CAN to the pump controller: an isolator and a transceiver at each node, 25 m of bus, 500 kbit/s with a 2 Mbit/s CAN FD data phase. */
export const PUMP_CAN_LINK: LinkInput = {
  schemaVersion: 2,
  name: 'Inverter to pump controller CAN',
  protocol: 'can',
  description: 'Control board CAN controller through a DIS-4 isolator and the CTX-5 transceiver to the pump controller, 25 m away on the same bus.',
  channels: [
    { id: 'txd', role: 'txd', label: 'controller TXD -> bus', stages: [{ ...DIS4 }, { ...CTX5 }], receiver: { ...lvcmos33 } },
    { id: 'rxd', role: 'rxd', label: 'bus -> controller RXD', stages: [{ ...CTX5 }, { ...DIS4 }], receiver: { ...lvcmos33 } },
  ],
  can: {
    bitRate: 500e3,
    clockHz: 40e6,
    samplePoint: 0.875,
    busLength: 25,
    delayPerMetre: 5e-9,
    clockTolerance: 0.001,
    fd: { dataBitRate: 2e6, dataSamplePoint: 0.75, tdc: true },
  },
}

/**
 * The display controller's RS-485 to the field display, half duplex. The firmware sets DE in the
 * same instruction that writes the first byte (and releases it 1 us after the last stop bit): the
 * slow driver enable cuts the start bit at the bus (fails); a DE lead of 5 us fixes it.
 */
export const FIELD_RS485_LINK: LinkInput = {
  schemaVersion: 2,
  name: 'Field display RS-485',
  protocol: 'rs485',
  description: 'Display controller UART through a DIS-1 isolator and the RTX-10 transceiver, 120 m of cable to the field display; DE through a second isolator channel.',
  channels: [
    { id: 'data', role: 'uart', label: 'controller TX -> field display RX', stages: [{ ...DIS1 }, { ...RTX10 }, { kind: 'wire', name: 'Field cable, 120 m', length: 120, delayPerMeter: 5e-9 }], receiver: { ...lvcmos33 } },
    { id: 'de', role: 'de', label: 'controller DE -> transceiver', stages: [{ ...DIS1 }, { ...RTX10 }], receiver: { ...lvcmos33 } },
  ],
  uart: {
    baud: 115200,
    dataBits: 8,
    parity: 'none',
    stopBits: 1,
    backToBack: true,
    requiredMarginUi: 0.1,
    berTarget: 1e-12,
    tx: { clockHz: 48e6, oversampling: 16, fractionBits: 4, tolerancePpm: 100 },
    rx: { errorPpm: 5000, oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
  },
  rs485: { duplex: 'half', leadTime: 0, lagTime: 1e-6 },
}

export const DEMO_PROJECT = {
  name: 'PX-7 pump inverter',
  description: 'Solar pump inverter: gate-driver board, control board and display controller.',
  links: [TELEMETRY_LINK, ADC_SPI_LINK, DEBUG_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK, FIELD_RS485_LINK],
}
