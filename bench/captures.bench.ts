/**
 * Capture bench: parse + extract a generated 1M-sample, 2-channel CSV file from disk,
 * and print the time and peak memory. Figures are printed, never asserted
 * (`npx tsx bench/captures.bench.ts`). For comparison, the same file read by papaparse
 * in streaming `step` mode (numbers converted, nothing kept): the reason for our own
 * line splitter (server/captures/parse.ts).
 */
import { createReadStream, createWriteStream, mkdtempSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { once } from 'node:events'
import Papa from 'papaparse'
import { analyseCaptureStream } from '../server/captures/analyse'
import { parseCapture } from '../server/captures/parse'
import { csvChunks, delayedEdges, nrzEdges, sampleWave } from '../tests/factories/captures'

const N = 1_000_000
const DT = 20e-9 // 20 ms of record at 50 MS/s
const BIT = 1 / 38400

async function writeCapture(path: string): Promise<void> {
  const input = nrzEdges(Math.floor((N * DT) / BIT) - 2, BIT, 10e-6, 3)
  const output = delayedEdges(input, { tPLH: 18e-6, tPHL: 3e-6, inverting: true, jitterRms: 50e-9 })
  const vin = sampleWave(N, 0, DT, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 }, noiseRms: 0.01, seed: 1 })
  const vout = sampleWave(N, 0, DT, { edges: output, low: 0.15, high: 3.3, rise: { kind: 'exp', tau: 2e-6 }, fall: { kind: 'ramp', duration: 0.8e-6 }, noiseRms: 0.02, seed: 2 })
  const out = createWriteStream(path)
  for (const chunk of csvChunks(0, DT, [vin, vout], ['Record Length,1000000', 'Sample Interval,2e-08', 'Time (s),TX pin (V),Coupler out (V)'])) {
    if (!out.write(chunk)) await once(out, 'drain')
  }
  out.end()
  await once(out, 'finish')
}

/** Runs `f` while sampling memory every 10 ms; returns its result, seconds and peaks in MB. */
async function measured<T>(f: () => Promise<T>): Promise<{ value: T; seconds: number; rssMB: number; heapMB: number; arrayBuffersMB: number }> {
  globalThis.gc?.()
  const base = process.memoryUsage()
  let rss = base.rss
  let heap = base.heapUsed
  let ab = base.arrayBuffers
  const sample = () => {
    const m = process.memoryUsage()
    rss = Math.max(rss, m.rss)
    heap = Math.max(heap, m.heapUsed)
    ab = Math.max(ab, m.arrayBuffers)
  }
  const timer = setInterval(sample, 10)
  const t0 = performance.now()
  const value = await f()
  const seconds = (performance.now() - t0) / 1000
  sample()
  clearInterval(timer)
  const mb = (x: number) => Math.round((x / 2 ** 20) * 10) / 10
  return { value, seconds, rssMB: mb(rss), heapMB: mb(heap), arrayBuffersMB: mb(ab) }
}

const dir = mkdtempSync(join(tmpdir(), 'bitslack-capture-bench-'))
const file = join(dir, 'capture-1M.csv')
try {
  await writeCapture(file)
  const size = statSync(file).size
  console.log(`capture: ${N} samples x 2 channels, ${(size / 2 ** 20).toFixed(1)} MB of CSV`)
  const base = process.memoryUsage()
  console.log(`before: rss ${(base.rss / 2 ** 20).toFixed(1)} MB, heap ${(base.heapUsed / 2 ** 20).toFixed(1)} MB`)

  const ours = await measured(() => analyseCaptureStream(createReadStream(file, { highWaterMark: 64 * 1024 })))
  const p = ours.value.result.pairing!
  console.log(`parse + extract: ${ours.seconds.toFixed(2)} s, peak rss ${ours.rssMB} MB, peak heap ${ours.heapMB} MB, peak array buffers ${ours.arrayBuffersMB} MB`)
  console.log(`  edges in/out ${ours.value.result.channels[0]!.edgeCount}/${ours.value.result.channels[1]!.edgeCount}, inverting ${p.inverting}, tPLH mean ${(p.tPLH!.mean * 1e6).toFixed(4)} us sigma ${(p.tPLH!.sigma * 1e9).toFixed(1)} ns (n ${p.tPLH!.count}), tPHL mean ${(p.tPHL!.mean * 1e6).toFixed(4)} us (n ${p.tPHL!.count}), display ${ours.value.waveform.t.length} buckets`)

  const parseOnly = await measured(() => parseCapture(createReadStream(file, { highWaterMark: 64 * 1024 })))
  console.log(`parse only (samples kept in typed arrays): ${parseOnly.seconds.toFixed(2)} s, ${parseOnly.value.sampleCount} samples, peak rss ${parseOnly.rssMB} MB, peak heap ${parseOnly.heapMB} MB`)

  const papa = await measured(
    () =>
      new Promise<number>((resolve, reject) => {
        let rows = 0
        let sum = 0
        Papa.parse(createReadStream(file, { highWaterMark: 64 * 1024 }) as unknown as File, {
          step: (r: Papa.ParseStepResult<string[]>) => {
            const d = r.data
            if (d.length === 3) {
              sum += Number(d[0]) + Number(d[1]) + Number(d[2])
              rows++
            }
          },
          complete: () => resolve(rows + (sum > 0 ? 0 : 0)),
          error: reject,
        })
      }),
  )
  console.log(`papaparse step (parse only, nothing kept, for comparison): ${papa.seconds.toFixed(2)} s, ${papa.value} rows, peak rss ${papa.rssMB} MB, peak heap ${papa.heapMB} MB`)
} finally {
  rmSync(dir, { recursive: true, force: true })
}
