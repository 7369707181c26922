/**
 * Starting points for a new link (issue 17): never invented numbers. Each stage is either a
 * part from the library (its class or datasheet values, named, with their source) or a
 * blank stage whose values are still to be entered (null: the link reads "incomplete" until
 * they are). The required margin and slack come from the team's policy; the clocks' errors
 * and the peripheral's timing are left for the user to enter.
 */
import type { ChannelSpec, LinkInput, StageSpec } from '#shared/schemas/link'
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
  }
}

/** Where a new link's stages come from: a part's stage (copied, with its part id), or blank stages. */
export type StageSource = { part: { id: string | number; stage: StageInput } } | 'blank'

function stageFrom(source: StageSource): StageInput {
  if (source === 'blank') return blankStage('digital')
  return { ...JSON.parse(JSON.stringify(source.part.stage)), partId: String(source.part.id) }
}

function channel(id: string, role: ChannelSpec['role'], label: string, source: StageSource): LinkInput['channels'][number] {
  const { family, vdd, vih, vil, schmitt, maxInputTransition } = RECEIVER_PRESETS[0]
  return { id, role, label, stages: [stageFrom(source)], receiver: { family, vdd, vih, vil, schmitt, maxInputTransition, invert: false } }
}

/** A new link of `protocol` whose stages come from `source`, its requirement from the team's `policy`. */
export function newLinkSpec(name: string, protocol: 'uart' | 'spi', policy: TeamPolicy, source: StageSource): LinkInput {
  if (protocol === 'uart')
    return {
      schemaVersion: 1,
      name,
      protocol,
      channels: [channel('tx', 'uart', 'TX -> RX', source)],
      uart: {
        baud: 115200,
        dataBits: 8,
        parity: 'none',
        stopBits: 1,
        backToBack: true,
        requiredMarginUi: policy.requiredMarginUi,
        tx: { errorPpm: missing },
        rx: { errorPpm: missing, sampler: 'ticks', oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
      },
    }
  return {
    schemaVersion: 1,
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
