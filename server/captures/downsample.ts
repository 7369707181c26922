import type { CaptureWaveform } from '../../shared/types/capture'
export type { CaptureWaveform }


/**
 * Min/max decimation computed while the file streams by, without knowing the sample
 * count in advance: buckets start one sample wide; whenever `maxBuckets` are full,
 * neighbouring pairs merge and the bucket width doubles. Every sample lands in exactly
 * one bucket, so narrow spikes survive (common practice for scope displays). Memory is
 * fixed at maxBuckets x (channels + 1) numbers; the total work is O(samples).
 */
export class MinMaxDownsampler {
  private readonly t: Float64Array
  private readonly lo: Float64Array[]
  private readonly hi: Float64Array[]
  private span = 1
  private full = 0
  private inBucket = 0

  constructor(private readonly channelCount: number, private readonly maxBuckets = 1000) {
    if (maxBuckets < 2 || maxBuckets % 2 !== 0) throw new RangeError('maxBuckets must be an even number >= 2')
    this.t = new Float64Array(maxBuckets)
    this.lo = Array.from({ length: channelCount }, () => new Float64Array(maxBuckets))
    this.hi = Array.from({ length: channelCount }, () => new Float64Array(maxBuckets))
  }

  /** Add one sample: its time and one value per channel. */
  push(time: number, values: ArrayLike<number>): void {
    const b = this.full
    if (this.inBucket === 0) {
      this.t[b] = time
      for (let c = 0; c < this.channelCount; c++) {
        this.lo[c]![b] = values[c]!
        this.hi[c]![b] = values[c]!
      }
    } else {
      for (let c = 0; c < this.channelCount; c++) {
        const v = values[c]!
        if (v < this.lo[c]![b]!) this.lo[c]![b] = v
        if (v > this.hi[c]![b]!) this.hi[c]![b] = v
      }
    }
    if (++this.inBucket === this.span) {
      this.inBucket = 0
      if (++this.full === this.maxBuckets) this.mergePairs()
    }
  }

  private mergePairs(): void {
    const half = this.maxBuckets / 2
    for (let i = 0; i < half; i++) {
      this.t[i] = this.t[2 * i]!
      for (let c = 0; c < this.channelCount; c++) {
        const lo = this.lo[c]!
        const hi = this.hi[c]!
        lo[i] = Math.min(lo[2 * i]!, lo[2 * i + 1]!)
        hi[i] = Math.max(hi[2 * i]!, hi[2 * i + 1]!)
      }
    }
    this.full = half
    this.span *= 2
  }

  /** The buckets so far (a partly filled last bucket included). */
  result(names: readonly string[]): CaptureWaveform {
    const n = this.full + (this.inBucket > 0 ? 1 : 0)
    return {
      samplesPerBucket: this.span,
      t: Array.from(this.t.subarray(0, n)),
      channels: Array.from({ length: this.channelCount }, (_, c) => ({
        name: names[c] ?? `ch${c + 1}`,
        min: Array.from(this.lo[c]!.subarray(0, n)),
        max: Array.from(this.hi[c]!.subarray(0, n)),
      })),
    }
  }
}

/**
 * The waveform for a plot `columns` pixels wide: consecutive buckets merged so that at most
 * `columns` remain, each keeping the lowest minimum and the highest maximum of those it
 * absorbs (min/max per pixel column: a one-sample spike still reaches the screen).
 */
export function mergeBuckets(wave: CaptureWaveform, columns: number): CaptureWaveform {
  const n = wave.t.length
  const k = Math.ceil(n / Math.max(1, columns))
  if (k <= 1) return wave
  const groups = Math.ceil(n / k)
  const pick = <T>(f: (from: number, to: number) => T) => Array.from({ length: groups }, (_, g) => f(g * k, Math.min(n, (g + 1) * k)))
  return {
    samplesPerBucket: wave.samplesPerBucket * k,
    t: pick((from) => wave.t[from]!),
    channels: wave.channels.map((c) => ({
      name: c.name,
      min: pick((from, to) => Math.min(...c.min.slice(from, to))),
      max: pick((from, to) => Math.max(...c.max.slice(from, to))),
    })),
  }
}
