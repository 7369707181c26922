/**
 * Starting points for a new link: valid inputs the user edits, never results. The stage
 * is a generic digital isolator channel; replace it from the part library.
 */
import type { ChannelSpec, LinkInput, StageSpec } from '#shared/schemas/link'
import { RECEIVER_PRESETS } from '#shared/utils/receiver-presets'

type StageInput = LinkInput['channels'][number]['stages'][number]

export function blankStage(kind: StageSpec['kind']): StageInput {
  switch (kind) {
    case 'digital':
      return {
        kind,
        name: 'Digital stage',
        inverting: false,
        tplh: { min: 10e-9, typ: 20e-9, max: 30e-9 },
        tphl: { min: 10e-9, typ: 20e-9, max: 30e-9 },
        tr: { typ: 2e-9, max: 4e-9 },
        tf: { typ: 2e-9, max: 4e-9 },
        edge: 'ramp',
      }
    case 'wire':
      return { kind, name: 'Cable', length: 1, delayPerMeter: 5e-9 }
    case 'rc':
      return { kind, name: 'Open-drain pull-up', r: 4700, c: 20e-12, passive: 'rise' }
    case 'phototransistor':
      return {
        kind,
        name: 'Phototransistor coupler',
        wiring: 'collector',
        ledOnWhen: 'high',
        driveVoltage: 3.3,
        vf: 1.2,
        rLed: 430,
        ctrMin: 0.5,
        ctrTestCurrent: 5e-3,
        ctrDerating: { temperature: 1, endOfLife: 1 },
        vcc: 3.3,
        rl: 2200,
        vceSat: 0.4,
        loadCap: 15e-12,
        characterization: [{ rl: 1000, tplh: 5e-6, tphl: 2e-6, tr: 4e-6, tf: 1.5e-6 }],
      }
  }
}

function channel(id: string, role: ChannelSpec['role'], label: string): LinkInput['channels'][number] {
  const { family, vdd, vih, vil, schmitt } = RECEIVER_PRESETS[0]
  return { id, role, label, stages: [blankStage('digital')], receiver: { family, vdd, vih, vil, schmitt, invert: false } }
}

export function newLinkSpec(name: string, protocol: 'uart' | 'spi'): LinkInput {
  if (protocol === 'uart')
    return {
      schemaVersion: 1,
      name,
      protocol,
      channels: [channel('tx', 'uart', 'TX -> RX')],
      uart: {
        baud: 115200,
        dataBits: 8,
        parity: 'none',
        stopBits: 1,
        backToBack: true,
        requiredMarginUi: 0.1,
        tx: { errorPpm: 10000 },
        rx: { errorPpm: 10000, sampler: 'ticks', oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
      },
    }
  return {
    schemaVersion: 1,
    name,
    protocol,
    channels: [channel('sclk', 'sclk', 'SCLK'), channel('mosi', 'mosi', 'MOSI'), channel('miso', 'miso', 'MISO'), channel('cs', 'cs', 'CS')],
    spi: {
      sclkHz: 1e6,
      cpol: 0,
      cpha: 0,
      requiredSlack: 0,
      controller: { misoSetup: 5e-9, misoHold: 2e-9 },
      peripheral: { mosiSetup: 5e-9, mosiHold: 5e-9, clockToOut: { min: 2e-9, max: 20e-9 } },
      packages: [],
    },
  }
}
