import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { MinMaxDownsampler } from '../../../../server/captures/downsample'

describe('min/max downsampler', () => {
  it('every bucket holds the min and max of its own consecutive samples, and there are at most maxBuckets', () => {
    // common practice: min/max decimation keeps the envelope (and narrow spikes) of a scope trace
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 1, maxLength: 3000 }),
        fc.integer({ min: 1, max: 40 }).map((k) => 2 * k),
        (values, maxBuckets) => {
          const d = new MinMaxDownsampler(1, maxBuckets)
          values.forEach((v, i) => d.push(i * 1e-6, [v]))
          const w = d.result(['a'])
          expect(w.t.length).toBeLessThanOrEqual(maxBuckets)
          expect(Math.log2(w.samplesPerBucket) % 1).toBe(0)
          expect(w.t.length).toBe(Math.ceil(values.length / w.samplesPerBucket))
          if (values.length > maxBuckets) expect(w.t.length).toBeGreaterThanOrEqual(maxBuckets / 2)
          w.t.forEach((t, b) => {
            const slice = values.slice(b * w.samplesPerBucket, (b + 1) * w.samplesPerBucket)
            expect(t).toBeCloseTo(b * w.samplesPerBucket * 1e-6, 12)
            expect(w.channels[0]!.min[b]).toBe(Math.min(...slice))
            expect(w.channels[0]!.max[b]).toBe(Math.max(...slice))
          })
        },
      ),
      { numRuns: 200 },
    )
  })

  it('a one-sample spike in a million samples survives into 2000 display points', () => {
    // common practice: a glitch must stay visible on the plot
    const d = new MinMaxDownsampler(2, 1000)
    const row = new Float64Array(2)
    for (let i = 0; i < 1_000_000; i++) {
      row[0] = i === 777_777 ? 5 : 1
      row[1] = -i
      d.push(i, row)
    }
    const w = d.result(['in', 'out'])
    expect(w.t.length).toBeLessThanOrEqual(1000)
    expect(w.t.length).toBeGreaterThanOrEqual(500)
    expect(Math.max(...w.channels[0]!.max)).toBe(5)
    expect(w.channels[0]!.max.filter((v) => v === 5)).toHaveLength(1)
    expect(Math.min(...w.channels[1]!.min)).toBe(-999_999)
  })
})
