/**
 * Synthetic oscilloscope captures with known edges, for the capture tests and the
 * capture bench: an NRZ bit pattern on the input, the output delayed by chosen tPLH /
 * tPHL (by the output's direction), optionally inverted, with ramp or exponential edges
 * and seeded Gaussian noise.
 */
import { analyseCaptureStream } from '../../server/captures/analyse'
import { summariseCaptureResult } from '../../shared/utils/capture-summary'

export type Polarity = 'rising' | 'falling'
export interface SynthEdge { t50: number; polarity: Polarity }
/** ramp: linear, `duration` is its 10-90 % time; exp: v = V(1 - e^(-t/tau)) toward the new level */
export type EdgeShape = { kind: 'ramp'; duration: number } | { kind: 'exp'; tau: number }

/** Seeded uniform PRNG in [0, 1) (mulberry32). */
export function prng(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Seeded standard normal samples (Box-Muller). */
export function gaussian(seed: number): () => number {
  const u = prng(seed)
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u())
}

/**
 * Edges of a random NRZ pattern: `bits` bit slots of `bitTime` from `start`, idle high
 * (UART idle), a start bit first, every level change one edge at a slot boundary.
 */
export function nrzEdges(bits: number, bitTime: number, start: number, seed = 1): SynthEdge[] {
  const r = prng(seed)
  const edges: SynthEdge[] = []
  let level = 1
  for (let b = 0; b < bits; b++) {
    const next = b === 0 ? 0 : r() < 0.5 ? 0 : 1
    if (next !== level) edges.push({ t50: start + b * bitTime, polarity: next ? 'rising' : 'falling' })
    level = next
  }
  if (level === 0) edges.push({ t50: start + bits * bitTime, polarity: 'rising' })
  return edges
}

/** The output edges a path with these delays (50 % to 50 %, by output direction) makes of the input edges. */
export function delayedEdges(input: readonly SynthEdge[], o: { tPLH: number; tPHL: number; inverting?: boolean; jitterRms?: number; seed?: number }): SynthEdge[] {
  const g = gaussian(o.seed ?? 7)
  return input.map((e) => {
    const polarity: Polarity = o.inverting ? (e.polarity === 'rising' ? 'falling' : 'rising') : e.polarity
    const d = polarity === 'rising' ? o.tPLH : o.tPHL
    return { t50: e.t50 + d + (o.jitterRms ? o.jitterRms * g() : 0), polarity }
  })
}

/** When the edge starts (0 % point) given its 50 % instant. */
function startOf(e: SynthEdge, shape: EdgeShape): number {
  return shape.kind === 'ramp' ? e.t50 - (0.5 * shape.duration) / 0.8 : e.t50 - shape.tau * Math.LN2
}

function fractionAt(dt: number, shape: EdgeShape): number {
  if (dt <= 0) return 0
  if (shape.kind === 'ramp') return Math.min(1, (dt * 0.8) / shape.duration)
  return 1 - Math.exp(-dt / shape.tau)
}

export interface WaveSpec {
  edges: readonly SynthEdge[]
  low: number
  high: number
  rise: EdgeShape
  fall: EdgeShape
  noiseRms?: number
  seed?: number
}

/** Sampled voltages at t0 + i dt (i < n) of a two-level signal with the given edges (each assumed to settle before the next). */
export function sampleWave(n: number, t0: number, dt: number, spec: WaveSpec): Float64Array {
  const out = new Float64Array(n)
  const g = gaussian(spec.seed ?? 3)
  const first = spec.edges[0]
  let level = first ? (first.polarity === 'rising' ? spec.low : spec.high) : spec.low
  let k = 0 // next edge to start
  let from = level
  let to = level
  let start = -Infinity
  let shape: EdgeShape = spec.rise
  for (let i = 0; i < n; i++) {
    const t = t0 + i * dt
    while (k < spec.edges.length && startOf(spec.edges[k]!, spec.edges[k]!.polarity === 'rising' ? spec.rise : spec.fall) <= t) {
      const e = spec.edges[k]!
      const s = e.polarity === 'rising' ? spec.rise : spec.fall
      const ns = startOf(e, s)
      from = from + (to - from) * fractionAt(ns - start, shape) // where the previous edge has got to
      to = e.polarity === 'rising' ? spec.high : spec.low
      start = ns
      shape = s
      k++
    }
    level = from + (to - from) * fractionAt(t - start, shape)
    out[i] = level + (spec.noiseRms ? spec.noiseRms * g() : 0)
  }
  return out
}

/** A capture as CSV text: optional header lines, then `time,ch...` rows. */
export function toCsv(t0: number, dt: number, channels: readonly Float64Array[], o: { delimiter?: string; header?: string[]; eol?: string } = {}): string {
  const d = o.delimiter ?? ','
  const eol = o.eol ?? '\n'
  const lines = [...(o.header ?? [])]
  const n = channels[0]!.length
  for (let i = 0; i < n; i++) {
    let s = (t0 + i * dt).toExponential(9)
    for (const c of channels) s += d + c[i]!.toFixed(5)
    lines.push(s)
  }
  return lines.join(eol) + eol
}

/** The same CSV as a stream of chunks of about `chunkChars` characters (for large captures). */
export function* csvChunks(t0: number, dt: number, channels: readonly Float64Array[], header: string[], chunkChars = 65536): Generator<string> {
  let buf = header.map((h) => h + '\n').join('')
  const n = channels[0]!.length
  for (let i = 0; i < n; i++) {
    let s = (t0 + i * dt).toExponential(9)
    for (const c of channels) s += ',' + c[i]!.toFixed(5)
    buf += s + '\n'
    if (buf.length >= chunkChars) {
      yield buf
      buf = ''
    }
  }
  if (buf) yield buf
}

/** Chunks of `text` of the given sizes, cycled (to test chunk boundaries). */
export async function* chunked(text: string | Uint8Array, sizes: readonly number[] = [65536]): AsyncGenerator<Uint8Array> {
  const bytes = typeof text === 'string' ? new TextEncoder().encode(text) : text
  let i = 0
  let k = 0
  while (i < bytes.length) {
    const n = Math.max(1, sizes[k++ % sizes.length]!)
    yield bytes.subarray(i, i + n)
    i += n
  }
}

/**
 * A bench capture of a coupler path with known delays: a random NRZ pattern on the input,
 * the output delayed by tPLH / tPHL (by output direction), a fast ramp in, an exponential
 * rise and a ramp fall out, with light noise. Slow enough (default 9600 Bd) for every edge
 * to settle. Returns the CSV text (with scope header lines) and the number of input edges.
 */
export function couplerCapture(o: { tPLH: number; tPHL: number; inverting?: boolean; bits?: number; bitTime?: number; seed?: number } = { tPLH: 22e-6, tPHL: 3e-6, inverting: true }) {
  const bits = o.bits ?? 60
  const bitTime = o.bitTime ?? 1 / 9600
  const input = nrzEdges(bits, bitTime, 20e-6, o.seed ?? 17)
  const output = delayedEdges(input, { tPLH: o.tPLH, tPHL: o.tPHL, inverting: o.inverting })
  const dt = 100e-9
  const n = Math.ceil((bits * bitTime + 100e-6) / dt)
  const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 }, noiseRms: 0.01, seed: 1 })
  const vout = sampleWave(n, 0, dt, { edges: output, low: 0.2, high: 3.3, rise: { kind: 'exp', tau: 15e-6 / Math.log(9) }, fall: { kind: 'ramp', duration: 2e-6 }, noiseRms: 0.02, seed: 2 })
  return { text: toCsv(0, dt, [vin, vout], { header: ['Record Length,' + n, 'Time (s),TX pin (V),Coupler out (V)'] }), edges: input.length }
}

/**
 * A long capture, extracted: 4,000 bit slots at 500 kBd, 50 ns sampling, fast edges, about 2,000
 * edges a channel (a full result of several hundred kB), for the paging test and the web bench.
 */
export async function largeExtraction() {
  const bit = 2e-6
  const input = nrzEdges(4000, bit, 1e-6, 5)
  const output = delayedEdges(input, { tPLH: 300e-9, tPHL: 150e-9, inverting: true, jitterRms: 5e-9 })
  const dt = 50e-9
  const n = Math.ceil((4000 * bit + 4e-6) / dt)
  const ramp = { kind: 'ramp', duration: 100e-9 } as const
  const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: ramp, fall: ramp, noiseRms: 0.01, seed: 1 })
  const vout = sampleWave(n, 0, dt, { edges: output, low: 0.1, high: 3.3, rise: ramp, fall: ramp, noiseRms: 0.02, seed: 2 })
  return analyseCaptureStream([toCsv(0, dt, [vin, vout], { header: ['Time (s),TX (V),RX (V)'] })], { input: 0, output: 1, inverting: true })
}

/** `count` stored capture rows of one link, all holding the same extraction (inserted in bulk, no upload). */
export function storedCaptures(o: { linkId: number; teamId: number; ownerId: number | null; count: number; keyPrefix: string }, x: Awaited<ReturnType<typeof largeExtraction>>) {
  return Array.from({ length: o.count }, (_, i) => ({
    linkId: o.linkId,
    teamId: o.teamId,
    ownerId: o.ownerId,
    label: `bench run ${i + 1}`,
    objectKey: `${o.keyPrefix}/${o.linkId}-${i}`,
    fileName: `run-${i + 1}.csv`,
    size: 12_000_000,
    contentType: 'text/csv',
    sha256: '0'.repeat(64),
    options: { input: 0, output: 1, inverting: true },
    status: 'done' as const,
    progress: 1,
    result: x.result,
    summary: summariseCaptureResult(x.result),
    waveform: x.waveform,
  }))
}
