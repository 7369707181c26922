import { CaptureFormatError } from './errors'
import type { CaptureWaveform } from './downsample'
import { DEFAULT_BINS, stateLevels, type StateLevels } from './levels'
import { pairEdges, type EdgePair, type Pairing } from './pairing'
import { parseCapture, type CaptureFormat, type ParseOptions, type ParsedCapture } from './parse'
import { RunningStats, type SummaryStats } from './stats'
import { findEdges, type Edge } from './transitions'
import type { CaptureChannelResult as ChannelResult, PairingResult, CaptureResult } from '../../shared/types/capture'
export type { ChannelResult, PairingResult, CaptureResult }

/** Version of the extraction method, stored with every result so a result can be traced. */
export const CAPTURE_METHOD_VERSION = 'captures-1'

export interface AnalyseOptions {
  /** index (among the voltage columns, 0-based) of the path's input channel; default 0 */
  input?: number
  /** index of the output channel; default 1 when there are two or more channels, else no pairing */
  output?: number | null
  /** whether the path inverts; detected from the edges when not given */
  inverting?: boolean
  /** hysteresis half-width as a fraction of the amplitude (default: 0.2, widened for noise) */
  hysteresis?: number
  /** histogram bins for the state levels (default 100) */
  bins?: number
  /** edges and pairs listed in the result per channel (the statistics use all); default 2000 */
  maxListed?: number
}




function channelIndex(value: number, count: number, what: string): number {
  if (!Number.isInteger(value) || value < 0 || value >= count) {
    throw new CaptureFormatError(null, `the ${what} channel ${value + 1} does not exist: the capture has ${count} voltage column${count === 1 ? '' : 's'}`)
  }
  return value
}

/** Levels, edges and tr/tf of every channel, then the input/output pairing. */
export function analyseCapture(parsed: ParsedCapture, options: AnalyseOptions = {}): CaptureResult {
  const maxListed = options.maxListed ?? 2000
  const warnings = [...parsed.format.warnings]
  const all: Edge[][] = []
  const channels: ChannelResult[] = parsed.channels.map((values, c) => {
    const col = parsed.format.channels[c]!
    const levels = stateLevels(values, parsed.ranges[c]!, options.bins ?? DEFAULT_BINS)
    if (!levels) {
      warnings.push(`channel "${col.name}" is flat: no transitions`)
      all.push([])
      return { name: col.name, unit: col.unit, levels: null, thresholds: null, edgeCount: 0, risingCount: 0, fallingCount: 0, edges: [], edgesTruncated: false, tr: null, tf: null }
    }
    const found = findEdges(parsed.time, values, levels, options.hysteresis)
    if ((4 * Math.max(levels.noiseLow, levels.noiseHigh)) / levels.amplitude > 0.4) {
      warnings.push(`channel "${col.name}" is noisy (rms ${Number(Math.max(levels.noiseLow, levels.noiseHigh).toPrecision(3))} V against an amplitude of ${Number(levels.amplitude.toPrecision(3))} V): edges may be missed or false`)
    }
    const tr = new RunningStats()
    const tf = new RunningStats()
    let rising = 0
    for (const e of found.edges) {
      if (e.polarity === 'rising') rising++
      if (e.duration !== null) (e.polarity === 'rising' ? tr : tf).push(e.duration)
    }
    all.push(found.edges)
    const dt = (parsed.time[parsed.sampleCount - 1]! - parsed.time[0]!) / (parsed.sampleCount - 1)
    const fastest = Math.min(tr.result()?.mean ?? Infinity, tf.result()?.mean ?? Infinity)
    if (fastest < 2 * dt) warnings.push(`channel "${col.name}": transition durations are within 2 sample intervals, so they are limited by the sampling, not measured`)
    return {
      name: col.name,
      unit: col.unit,
      levels,
      thresholds: { lower: found.lower, upper: found.upper },
      edgeCount: found.edges.length,
      risingCount: rising,
      fallingCount: found.edges.length - rising,
      edges: found.edges.slice(0, maxListed),
      edgesTruncated: found.edges.length > maxListed,
      tr: tr.result(),
      tf: tf.result(),
    }
  })
  const count = parsed.channels.length
  let pairing: PairingResult | null = null
  const outputChoice = options.output === undefined ? (count >= 2 ? 1 : null) : options.output
  if (outputChoice !== null) {
    const input = channelIndex(options.input ?? 0, count, 'input')
    const output = channelIndex(outputChoice, count, 'output')
    if (input === output) throw new CaptureFormatError(null, 'the input and output channels must differ')
    const p = pairEdges(all[input]!, all[output]!, options.inverting === undefined ? {} : { inverting: options.inverting })
    if (p.inversionSource === 'detected' && p.inversionAgreement === null) warnings.push('could not tell whether the path inverts (no output edge follows an input edge); assumed non-inverting')
    if (p.unpairedInputEdges > 0) warnings.push(`${p.unpairedInputEdges} input edge(s) had no output edge of the expected direction before the next input edge of the same direction`)
    pairing = { ...p, input, output, pairs: p.pairs.slice(0, maxListed), pairsTruncated: p.pairs.length > maxListed, pairCount: p.pairs.length }
  }
  const n = parsed.sampleCount
  const timeStart = parsed.time[0]!
  const timeEnd = parsed.time[n - 1]!
  return {
    method: CAPTURE_METHOD_VERSION,
    format: parsed.format,
    sampleCount: n,
    timeStart,
    timeEnd,
    sampleInterval: (timeEnd - timeStart) / (n - 1),
    channels,
    pairing,
    warnings,
  }
}

/** Parse a capture from a stream and analyse it: the measured result and the display waveform. */
export async function analyseCaptureStream(source: AsyncIterable<Uint8Array | string> | Iterable<Uint8Array | string>, options: ParseOptions & AnalyseOptions = {}): Promise<{ result: CaptureResult; waveform: CaptureWaveform }> {
  const parsed = await parseCapture(source, options)
  return { result: analyseCapture(parsed, options), waveform: parsed.waveform }
}
