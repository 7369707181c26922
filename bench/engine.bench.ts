/**
 * Engine benchmark: prints medians, asserts nothing. Run with `npx tsx bench/engine.bench.ts`.
 *
 * Goals (figures, not assertions): full UART analysis <= 1 ms, max-baud search <= 2 ms,
 * 100k-trial spread study <= 150 ms, pull-up sweep >= 1000x faster than the transistor-level
 * coupler reference in ngspice over the same rows; the grid agreement table of the coupler
 * model against that reference (within 15 %, never more than 5 % short).
 *
 * The data is the demo scenario's telemetry link (invented values).
 */
import { performance } from 'node:perf_hooks'
import { LinkSpec, type PhototransistorStage } from '../shared/schemas/link'
import { FIELD_RS485_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK, TELEMETRY_LINK } from '../server/db/seeders/demo-links'
import { analyzeLink } from '../server/timing/analyze'
import { canBitTimings, canMaxBusLength } from '../server/timing/can'
import { analyzeChain } from '../server/timing/chain'
import { i2cBus } from '../server/timing/i2c'
import { rateErrorBounds } from '../server/timing/clock'
import { seriesValues } from '../server/timing/eseries'
import { phototransistorModel } from '../server/timing/phototransistor'
import { sweepPullup } from '../server/timing/sweep'
import { frameLayout, maxBaud, samplerModel, MAX_BAUD_CAP, type ReceiverEnd } from '../server/timing/uart'
import { AGREEMENT_GRID, BENCH_VALUES, distanceFromRange, ngspiceVersion, REFERENCE, runCouplerCases, type CouplerCase } from './coupler-spice'

/** Median wall time of `fn`, milliseconds, after `warmup` untimed calls. */
function median(fn: () => unknown, runs: number, warmup: number): number {
  for (let i = 0; i < warmup; i++) fn()
  const t: number[] = []
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now()
    fn()
    t.push(performance.now() - t0)
  }
  t.sort((a, b) => a - b)
  const m = t.length >> 1
  return t.length % 2 ? t[m]! : (t[m - 1]! + t[m]!) / 2
}

const fmt = (ms: number) => (ms >= 100 ? ms.toFixed(0) : ms >= 1 ? ms.toFixed(2) : ms.toFixed(4)) + ' ms'
const line = (what: string, ms: number, goal: string) => console.log(`${what.padEnd(52)} ${fmt(ms).padStart(12)}   goal ${goal}`)

const link = LinkSpec.parse(TELEMETRY_LINK)
const channel = link.channels[0]!
const stage = channel.stages[0] as PhototransistorStage
const uart = link.uart!

console.log(`Bitslack engine benchmark (Node ${process.version}); link: ${link.name}`)
console.log('')

// 1. full UART analysis: every data pattern, every corner, rate sweep and standard rates
line('full UART analysis (analyzeLink)', median(() => analyzeLink(link), 200, 50), '<= 1 ms')

// 2. the max-baud search alone, on the link's distortion and clock errors
{
  const chain = analyzeChain(channel, { path: ['channels', 0] })
  const invert = channel.receiver.invert ?? false
  const pwd = invert ? { min: -chain.pwd.max, max: -chain.pwd.min } : chain.pwd
  const rx = uart.rx as ReceiverEnd
  const layout = frameLayout(uart.dataBits, uart.parity, uart.stopBits, uart.backToBack)
  const sampler = samplerModel(rx)
  const errors = { tx: rateErrorBounds(uart.tx, uart.baud, uart.tx.oversampling ?? 16), rx: rateErrorBounds(rx, uart.baud, rx.oversampling) }
  const d = { pwd, jitterPeak: chain.jitterPeak, jitterRms: chain.jitterRms }
  line('max-baud search (uart.maxBaud)', median(() => maxBaud(layout, sampler, d, errors, uart.requiredMarginUi, MAX_BAUD_CAP), 2000, 200), '<= 2 ms')
  line('max-baud incl. chain (analyzeChain + maxBaud)', median(() => {
    const c = analyzeChain(channel)
    return maxBaud(layout, sampler, { pwd: c.pwd, jitterPeak: c.jitterPeak, jitterRms: c.jitterRms }, errors, uart.requiredMarginUi, MAX_BAUD_CAP)
  }, 2000, 200), '<= 2 ms')
}

// 2b. bus links (issue 15): the building blocks, then the full analysis of each demo bus link (the CAN one includes its bit-timing table search)
{
  // TI DCAN TRM worked example's node (driver 60 ns, receiver 40 ns) behind a 25 ns isolator each way, 40 m, 80 MHz, 500 kbit/s
  const node = { isolatorTx: 25e-9, driver: 60e-9, receiver: 40e-9, isolatorRx: 25e-9 }
  const can = { clockHz: 80e6, bitRate: 500e3, nodes: [node, node] as [typeof node, typeof node], length: 40 }
  line('CAN bit-timing table + longest bus (canBitTimings)', median(() => [canBitTimings(can), canMaxBusLength(can)], 2000, 200), '<= 1 ms')
  // common practice: Fast mode, 3.3 V both sides, 2.2 kOhm and 100 pF per side, a 30/50 ns isolator
  const side = { vdd: 3.3, rp: 2200, cb: 100e-12 }
  const i2c = { mode: 'fast' as const, a: side, b: side, isolator: { abFall: 30e-9, abRise: 50e-9, ba: 50e-9 }, fScl: 400e3 }
  line('isolated I2C bus (i2cBus, both sides)', median(() => i2cBus(i2c), 2000, 200), '<= 1 ms')
  const [i2cLink, canLink, rs485Link] = [MONITOR_I2C_LINK, PUMP_CAN_LINK, FIELD_RS485_LINK].map((l) => LinkSpec.parse(l))
  line('I2C link analysis (analyzeLink, checks + pull-up sweep per side)', median(() => analyzeLink(i2cLink!), 1000, 100), '<= 1 ms')
  line('CAN link analysis (analyzeLink, bit-timing table + FD)', median(() => analyzeLink(canLink!), 1000, 100), '<= 1 ms')
  line('RS-485 link analysis (analyzeLink, UART + turnaround)', median(() => analyzeLink(rs485Link!), 500, 50), '<= 1 ms')
}

// 3. spread study, 100k trials (module of the engine core)
try {
  const { spreadStudy } = (await import('../server/timing/spread')) as {
    spreadStudy: (l: typeof link, o: { trials: number; seed: number }) => unknown
  }
  line('spread study, 100k trials (spreadStudy)', median(() => spreadStudy(link, { trials: 100_000, seed: 1 }), 5, 1), '<= 150 ms')
} catch (e) {
  console.log(`spread study: not measured (${(e as Error).message.split('\n')[0]})`)
}

// 4. the coupler model: calibration, a 288-row E96 sweep, the same rows through the
// transistor-level reference in ngspice, and the grid agreement table (issue 11)
const rlMin = 100
const rlMax = 97_600
const rls = seriesValues('E96', rlMin, rlMax)
{
  const pts = stage.characterization
  // a fresh copy each run: the calibration cache is keyed by content, so vary it by a femtosecond
  let k = 0
  const calMs = median(() => phototransistorModel({ ...stage, characterization: pts.map((p, i) => (i === 0 ? { ...p, tplh: p.tplh! + ++k * 1e-15 } : p)) }), 41, 10)
  line(`coupler model calibration (${pts.length} points, least squares)`, calMs, '')
}
// a few milliseconds each: enough runs that one scheduler or GC pause does not set the median
const sweepMs = median(() => sweepPullup(link, channel.id, 0, { series: 'E96', rlMin, rlMax, overdrive: 1 }), 41, 10)
line(`pull-up sweep, E96 ${rlMin} ohm..${rlMax / 1000} kohm (${rls.length} rows)`, sweepMs, 'ngspice / 1000')
const modelMs = median(() => rls.map((rl) => phototransistorModel({ ...stage, rl })), 41, 10)
line(`  its stage models alone (${rls.length} x phototransistorModel)`, modelMs, '')

const version = ngspiceVersion()
if (version === null) {
  console.log('ngspice: not installed (apt-get install -y ngspice); the ratio and the agreement table are not measured')
} else {
  console.log('')
  console.log(version)
  // the same rows through the reference: each row's pull-up and LED current, the stage's load
  const sweep = sweepPullup(link, channel.id, 0, { series: 'E96', rlMin, rlMax, overdrive: 1 })
  const rowCases: CouplerCase[] = sweep.rows.map((r) => ({ rl: r.rl, ledCurrent: r.ledCurrent ?? r.ledCurrentRequired, loadCap: stage.loadCap ?? 0, vcc: stage.vcc }))
  const t0 = performance.now()
  await runCouplerCases(rowCases, 1)
  const spiceMs = performance.now() - t0
  line(`ngspice transistor-level reference, same ${rls.length} rows (one process each)`, spiceMs, '')
  console.log(`sweep speed-up over ngspice (full sweep, margins included):   ${(spiceMs / sweepMs).toFixed(0)}x   goal >= 1000x`)
  console.log(`sweep speed-up over ngspice (stage models only):               ${(spiceMs / modelMs).toFixed(0)}x`)

  // bench values of the class against the reference (common practice, timing-model.md 5)
  const benchM = await runCouplerCases(BENCH_VALUES.map((b) => b.at), 2)
  console.log('')
  console.log('Reference (bench/coupler.cir) against the bench values of the class (common practice, no source):')
  BENCH_VALUES.forEach((b, i) => {
    const m = benchM[i]!
    const cell = (q: 'tplh' | 'tphl' | 'tr' | 'tf') => {
      const [lo, hi] = b[q]
      const range = lo === hi ? `${(lo * 1e6).toFixed(1)}` : `${(lo * 1e6).toFixed(1)}-${(hi * 1e6).toFixed(1)}`
      const d = distanceFromRange(m[q], b[q])
      return `${q} ${(m[q] * 1e6).toFixed(2)} us (bench ${range}: ${d === 0 ? 'inside' : `${d > 0 ? '+' : ''}${(d * 100).toFixed(0)} %`})`
    }
    console.log(`  ${b.label.padEnd(20)} ${cell('tplh')}, ${cell('tphl')}, ${cell('tr')}, ${cell('tf')}`)
  })

  // the grid agreement table: calibrate from the reference's 4.7 kOhm / 10 mA point, compare everywhere else
  const grid = await runCouplerCases(AGREEMENT_GRID, 2)
  const calPoint = { rl: 4700, ledCurrent: 10e-3, loadCap: 0, tplh: benchM[0]!.tplh, tphl: benchM[0]!.tphl, tr: benchM[0]!.tr, tf: benchM[0]!.tf }
  const worst = { tplh: [0, 0], tphl: [0, 0], tr: [0, 0], tf: [0, 0] } as Record<'tplh' | 'tphl' | 'tr' | 'tf', [number, number]>
  let compared = 0
  AGREEMENT_GRID.forEach((k, i) => {
    const st = LinkSpec.parse({
      ...link,
      channels: [{ ...channel, stages: [{ kind: 'phototransistor', name: 'reference', driveVoltage: 5, vf: 1.2, ledCurrent: k.ledCurrent, driver: 'transistor', ctrMin: REFERENCE.ctrMin, ctrTyp: REFERENCE.ctrTyp, hfe: REFERENCE.hfe, vcc: 5, rl: k.rl, vceSat: 0.1, loadCap: k.loadCap, ...(k.rbe ? { rbe: k.rbe } : {}), characterization: [calPoint] }] }],
    }).channels[0]!.stages[0] as PhototransistorStage
    const r = phototransistorModel(st)
    if (!r.operating.saturated) return
    compared++
    for (const q of ['tplh', 'tphl', 'tr', 'tf'] as const) {
      const e = r.model[q].typ / grid[i]![q] - 1
      worst[q][0] = Math.min(worst[q][0], e)
      worst[q][1] = Math.max(worst[q][1], e)
    }
  })
  console.log('')
  console.log(`Grid agreement, engine calibrated from one simulated point (4.7 kOhm, 10 mA), ${compared} of ${AGREEMENT_GRID.length} grid points where the output saturates:`)
  console.log('  quantity   most optimistic   most pessimistic   goal: within 15 %, never more than 5 % short')
  for (const q of ['tplh', 'tphl', 'tr', 'tf'] as const)
    console.log(`  ${q.padEnd(8)}   ${(worst[q][0] * 100).toFixed(1).padStart(8)} %   ${(worst[q][1] * 100).toFixed(1).padStart(12)} %`)
}
