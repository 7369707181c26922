/**
 * Small link builders for the engine's unit tests. Part names are generic and every
 * number is invented unless a test names its source.
 */
import type { LinkInput } from '../../../../shared/schemas/link'

export const ns = 1e-9
export const us = 1e-6

type Stage = NonNullable<LinkInput['channels']>[number]['stages'][number]
type Receiver = NonNullable<LinkInput['channels']>[number]['receiver']
type Uart = NonNullable<LinkInput['uart']>

export const LVCMOS33: Receiver = { vdd: 3.3, vih: 2.0, vil: 0.8 }

/** A digital stage with exact (min = typ = max) delays and ideal edges unless given. */
type DigitalInput = Extract<Stage, { kind: 'digital' }>

export function digital(tplh: number, tphl: number, extra: Partial<DigitalInput> = {}): DigitalInput {
  return {
    kind: 'digital',
    name: 'generic digital isolator',
    inverting: false,
    tplh: { min: tplh, typ: tplh, max: tplh },
    tphl: { min: tphl, typ: tphl, max: tphl },
    ...extra,
  }
}

/** A UART link: one channel (or two) with the given stages and settings. */
export function uartLink(stages: Stage[], uart: Partial<Uart> = {}, receiver: Receiver = LVCMOS33, second?: Stage[]): LinkInput {
  return {
    schemaVersion: 1,
    name: 'test link',
    protocol: 'uart',
    channels: [
      { id: 'a2b', role: 'uart', stages, receiver },
      ...(second ? [{ id: 'b2a', role: 'uart' as const, stages: second, receiver }] : []),
    ],
    uart: {
      baud: 115200,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      backToBack: true,
      requiredMarginUi: 0,
      tx: { errorPpm: 0 },
      rx: { errorPpm: 0, oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority' },
      ...uart,
    },
  }
}

/** Every number in a value, with its path, for the no-NaN / no-infinity checks. */
export function nonFinite(value: unknown, path = ''): string[] {
  if (typeof value === 'number') return Number.isFinite(value) ? [] : [path]
  if (Array.isArray(value)) return value.flatMap((v, i) => nonFinite(v, `${path}[${i}]`))
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => nonFinite(v, `${path}.${k}`))
  return []
}
