/**
 * Engine benchmark: prints medians, asserts nothing. Run with `npx tsx bench/engine.bench.ts`.
 *
 * Goals (figures, not assertions): full UART analysis <= 1 ms, max-baud search <= 2 ms,
 * 100k-trial spread study <= 150 ms, pull-up sweep >= 1000x faster than ngspice doing
 * the same resistor sweep, with tr within 3 %.
 *
 * The data is the demo scenario's telemetry link (invented values).
 */
import { performance } from 'node:perf_hooks'
import { LinkSpec, type PhototransistorStage } from '../shared/schemas/link'
import { TELEMETRY_LINK } from '../server/db/seeders/demo-links'
import { analyzeLink } from '../server/timing/analyze'
import { analyzeChain } from '../server/timing/chain'
import { rateErrorBounds } from '../server/timing/clock'
import { seriesValues } from '../server/timing/eseries'
import { phototransistorModel } from '../server/timing/phototransistor'
import { sweepPullup } from '../server/timing/sweep'
import { frameLayout, maxBaud, samplerModel, MAX_BAUD_CAP, type ReceiverEnd } from '../server/timing/uart'
import { ngspiceVersion, runRcEdges, type RcEdgeCase } from './ngspice-rc'

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

// 3. spread study, 100k trials (module of the engine core)
try {
  const { spreadStudy } = (await import('../server/timing/spread')) as {
    spreadStudy: (l: typeof link, o: { trials: number; seed: number }) => unknown
  }
  line('spread study, 100k trials (spreadStudy)', median(() => spreadStudy(link, { trials: 100_000, seed: 1 }), 5, 1), '<= 150 ms')
} catch (e) {
  console.log(`spread study: not measured (${(e as Error).message.split('\n')[0]})`)
}

// 4. pull-up sweep over E96 across three decades, and the same RL values through ngspice
const rlMin = 100
const rlMax = 97_600
const rls = seriesValues('E96', rlMin, rlMax)
// a few milliseconds each: enough runs that one scheduler or GC pause does not set the median
const sweepMs = median(() => sweepPullup(link, channel.id, 0, { series: 'E96', rlMin, rlMax, overdrive: 1 }), 41, 10)
line(`pull-up sweep, E96 ${rlMin} ohm..${rlMax / 1000} kohm (${rls.length} rows)`, sweepMs, 'ngspice / 1000')
const electricalMs = median(() => rls.map((rl) => phototransistorModel({ ...stage, rl })), 50, 5)
line(`  its stage models alone (${rls.length} x phototransistorModel)`, electricalMs, '')

const version = ngspiceVersion()
if (version === null) {
  console.log('ngspice: not installed (apt-get install -y ngspice); the ratio is not measured')
} else {
  // the RC part of the passive rising edge at each RL: pull-up to VCC, the stage's load, ideal switch
  const vLow = stage.vceSat ?? 0.4
  const c = stage.loadCap && stage.loadCap > 0 ? stage.loadCap : 15e-12
  const cases: RcEdgeCase[] = rls.map((r) => ({
    r,
    c,
    vLow,
    vHigh: stage.vcc,
    riseLevels: { p10: vLow + 0.1 * (stage.vcc - vLow), p90: vLow + 0.9 * (stage.vcc - vLow) },
    fallLevels: {},
    stepsPerTau: 200,
  }))
  const t0 = performance.now()
  const measured = runRcEdges(cases)
  const spiceMs = performance.now() - t0
  line(`ngspice, same ${rls.length} RL values (one batch run each)`, spiceMs, '')
  // engine side of the same quantity: the load term of the stage model with instantaneous switching
  let worst = 0
  rls.forEach((rl, i) => {
    const rcOnly: PhototransistorStage = {
      ...stage,
      rl,
      loadCap: c,
      partSkew: undefined,
      characterization: [
        { rl: rlMin, tplh: 0, tphl: 0, tr: 0, tf: 0, loadCap: 0 },
        { rl: rlMax, tplh: 0, tphl: 0, tr: 0, tf: 0, loadCap: 0 },
      ],
    }
    const engineTr = phototransistorModel(rcOnly).model.tr.typ
    const spiceTr = measured[i]!.rise.p90! - measured[i]!.rise.p10!
    worst = Math.max(worst, Math.abs(engineTr / spiceTr - 1))
  })
  console.log('')
  console.log(`${version}`)
  console.log(`sweep speed-up over ngspice (full sweep, margins included):   ${(spiceMs / sweepMs).toFixed(0)}x   goal >= 1000x`)
  console.log(`sweep speed-up over ngspice (stage electrical part only):      ${(spiceMs / electricalMs).toFixed(0)}x`)
  console.log(`tr agreement, RC part (ln 9 RC vs ngspice 10-90 %), worst row: ${(worst * 100).toFixed(3)} %   goal <= 3 %`)
}
