/**
 * Starting points for a new link (issue 17): never invented numbers. Each stage is either a
 * part from the library (its class or datasheet values, named, with their source) or a
 * blank stage whose values are still to be entered (null: the link reads "incomplete" until
 * they are). The required margin and slack come from the team's policy; the clocks' errors
 * and the peripheral's timing are left for the user to enter.
 */
import { LINK_SCHEMA_VERSION, type ChannelSpec, type LinkInput, type Protocol, type StageSpec } from '#shared/schemas/link'
import type { TeamPolicy } from '#shared/schemas/team'
import { RECEIVER_PRESETS } from '#shared/utils/receiver-presets'

type StageInput = LinkInput['channels'][number]['stages'][number]

/** A value still to be entered (the draft schema counts it as missing, never as a number). */
const missing = null as unknown as number
const blankCorners = () => ({ min: missing, typ: missing, max: missing })

/** A stage of `kind` with its datasheet values left to enter. */
export function blankStage(kind: StageSpec['kind']): StageInput {
  switch (kind) {
    case 'digital':
      return { kind, name: 'Digital stage', inverting: false, tplh: blankCorners(), tphl: blankCorners(), edge: 'ramp' }
    case 'wire':
      return { kind, name: 'Cable', length: missing, delayPerMeter: 5e-9 }
    case 'rc':
      return { kind, name: 'Open-drain pull-up', r: missing, c: missing, passive: 'rise' }
    case 'phototransistor':
      return {
        kind,
        name: 'Phototransistor coupler',
        wiring: 'collector',
        ledOnWhen: 'high',
        driveVoltage: missing,
        vf: missing,
        rLed: missing,
        ctrMin: missing,
        vcc: missing,
        rl: missing,
        characterization: [{ rl: missing, tplh: missing, tphl: missing, tr: missing, tf: missing }],
      }
    case 'transceiver':
      return { kind, name: 'Bus transceiver', driverDelay: blankCorners(), receiverDelay: blankCorners(), skew: 0 }
  }
}

/** Where a new link's stages come from: a part's stage (copied, with its part id), or blank stages. */
export type StageSource = { part: { id: string | number; stage: StageInput } } | 'blank'

function stageFrom(source: StageSource): StageInput {
  if (source === 'blank') return blankStage('digital')
  return { ...JSON.parse(JSON.stringify(source.part.stage)), partId: String(source.part.id) }
}

function channel(id: string, role: ChannelSpec['role'], label: string, source: StageSource | StageInput[]): LinkInput['channels'][number] {
  const { family, vdd, vih, vil, schmitt, maxInputTransition } = RECEIVER_PRESETS[0]
  const stages = Array.isArray(source) ? source : [stageFrom(source)]
  return { id, role, label, stages, receiver: { family, vdd, vih, vil, schmitt, maxInputTransition, invert: false } }
}

/**
 * The isolator and the transceiver of a bus node: the transceiver from its own source (or a
 * transceiver part given as the stages' source), the isolator from the stages' source; blank where
 * neither gives one.
 */
function busNode(source: StageSource, transceiverSource: StageSource): { isolator: () => StageInput; transceiver: () => StageInput } {
  const isTransceiver = (s: StageSource) => s !== 'blank' && s.part.stage.kind === 'transceiver'
  const tSource = transceiverSource !== 'blank' ? transceiverSource : isTransceiver(source) ? source : 'blank'
  return {
    isolator: () => (source === 'blank' || isTransceiver(source) ? { ...blankStage('digital'), name: 'Isolator channel' } : stageFrom(source)),
    transceiver: () => (tSource === 'blank' ? blankStage('transceiver') : stageFrom(tSource)),
  }
}

/** A transceiver for a driver-enable channel: its enable and disable times to enter when the part does not state them. */
function withEnableTimes(t: StageInput): StageInput {
  return t.kind === 'transceiver' ? { ...t, enableTime: t.enableTime ?? missing, disableTime: t.disableTime ?? missing } : t
}

const blankI2cSide = () => ({ vdd: missing, rp: missing, cb: missing })

/** A UART frame of 8N1 at 115200 Bd with the team's required margin; both clocks' errors left to enter. */
function uartSettings(policy: TeamPolicy): NonNullable<LinkInput['uart']> {
  return {
    baud: 115200,
    dataBits: 8,
    parity: 'none',
    stopBits: 1,
    backToBack: true,
    requiredMarginUi: policy.requiredMarginUi,
    tx: { errorPpm: missing },
    rx: { errorPpm: missing, sampler: 'ticks', oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
  }
}

/** A new link of `protocol` whose stages come from `source` (CAN and RS-485: the transceivers from `transceiverSource`), its requirement from the team's `policy`. */
export function newLinkSpec(name: string, protocol: Protocol, policy: TeamPolicy, source: StageSource, transceiverSource: StageSource = 'blank'): LinkInput {
  const node = busNode(source, transceiverSource)
  if (protocol === 'i2c')
    return {
      schemaVersion: LINK_SCHEMA_VERSION,
      name,
      protocol,
      channels: [channel('scl', 'scl', 'controller SCL -> target SCL', source), channel('sda', 'sda', 'target SDA -> controller SDA', source)],
      i2c: { mode: 'fast', sclHz: 400e3, requiredSlack: 0, controller: { ...blankI2cSide(), tHdDat: 0 }, target: blankI2cSide(), isolator: { offsetSide: 'controller' } },
    }
  if (protocol === 'can')
    return {
      schemaVersion: LINK_SCHEMA_VERSION,
      name,
      protocol,
      channels: [channel('txd', 'txd', 'controller TXD -> bus', [node.isolator(), node.transceiver()]), channel('rxd', 'rxd', 'bus -> controller RXD', [node.transceiver(), node.isolator()])],
      can: { bitRate: 500e3, clockHz: missing, samplePoint: 0.875, busLength: missing, delayPerMetre: 5e-9 },
    }
  if (protocol === 'rs485')
    return {
      schemaVersion: LINK_SCHEMA_VERSION,
      name,
      protocol,
      channels: [
        channel('data', 'uart', 'TX -> far end RX', [node.isolator(), node.transceiver()]),
        channel('de', 'de', 'DE -> transceiver', [node.isolator(), withEnableTimes(node.transceiver())]),
      ],
      uart: uartSettings(policy),
      rs485: { duplex: 'half', leadTime: 0, lagTime: 0 },
    }
  if (protocol === 'uart')
    return {
      schemaVersion: LINK_SCHEMA_VERSION,
      name,
      protocol,
      channels: [channel('tx', 'uart', 'TX -> RX', source)],
      uart: uartSettings(policy),
    }
  return {
    schemaVersion: LINK_SCHEMA_VERSION,
    name,
    protocol,
    channels: [channel('sclk', 'sclk', 'SCLK', source), channel('mosi', 'mosi', 'MOSI', source), channel('miso', 'miso', 'MISO', source), channel('cs', 'cs', 'CS', source)],
    spi: {
      sclkHz: 1e6,
      cpol: 0,
      cpha: 0,
      requiredSlack: 0,
      requiredSlackFraction: policy.requiredSlackFraction,
      controller: { misoSetup: missing, misoHold: missing },
      peripheral: { mosiSetup: missing, mosiHold: missing, clockToOut: { min: missing, max: missing } },
      packages: [],
    },
  }
}
