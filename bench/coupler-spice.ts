/**
 * ngspice runs of the transistor-level coupler reference `bench/coupler.cir`, shared by the
 * reference test, the benchmark and the agreement table: one case per operating point
 * (pull-up, LED current, load capacitance, optional base-emitter resistor), one
 * `ngspice -b` process each.
 */
import { spawn, spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

export interface CouplerCase {
  /** pull-up, ohms */
  rl: number
  /** LED current, amperes */
  ledCurrent: number
  /** load capacitance, farads */
  loadCap: number
  /** base-emitter resistor, ohms (absent: open base) */
  rbe?: number
  /** output supply, volts (default 5) */
  vcc?: number
}

/** Measured switching of one case, seconds and volts. */
export interface CouplerMeasured {
  tplh: number
  tphl: number
  tr: number
  tf: number
  /** saturated output level and the supply level */
  vlow: number
  vhigh: number
}

/** The reference's own gain and typical CTR (from the netlist: BF and the photocurrent ratio). */
export const REFERENCE = { hfe: 500, ctrTyp: 0.75, ctrMin: 0.2 } as const

const here = dirname(fileURLToPath(import.meta.url))
const template = () => readFileSync(join(here, 'coupler.cir'), 'utf8')

/** The ngspice version line, or null when ngspice is not on the PATH. */
export function ngspiceVersion(): string | null {
  const r = spawnSync('ngspice', ['-v'], { encoding: 'utf8' })
  if (r.error || r.status !== 0) return null
  const line = r.stdout.split('\n').find((l) => /ngspice/i.test(l))
  return (line ?? 'ngspice').trim()
}

/**
 * The netlist of one case: the LED on long enough for the output to settle, then off long
 * enough for the slowest rise (both at least ten times the output's time constant, RL times
 * the Miller capacitance of the class, about 1.3 nF, plus the load).
 */
export function couplerNetlist(k: CouplerCase, text = template()): string {
  const ton = 10e-6
  const tau = k.rl * (1.3e-9 + k.loadCap)
  const onFor = Math.max(120e-6, 10 * tau)
  const offFor = Math.max(300e-6, 12 * tau + 100e-6)
  const toff = ton + onFor
  const fill: Record<string, string> = {
    IF: String(k.ledCurrent),
    TON: String(ton),
    TONW: String(onFor),
    TOFF: String(toff),
    TLOWFROM: String(toff - 10e-6),
    TSTOP: String(toff + offFor),
    VCC: String(k.vcc ?? 5),
    RL: String(k.rl),
    CL: String(k.loadCap > 0 ? k.loadCap : 1e-18),
    RBE_LINE: k.rbe !== undefined ? `Rbe b 0 ${k.rbe}` : '* no base-emitter resistor',
  }
  return text.replace(/\{\{([A-Z_]+)\}\}/g, (_, name: string) => {
    const v = fill[name]
    if (v === undefined) throw new Error(`coupler.cir: no value for {{${name}}}`)
    return v
  })
}

function parse(stdout: string, k: CouplerCase): CouplerMeasured {
  const get = (n: string) => {
    const m = new RegExp(`^${n}\\s*=\\s*([-+0-9.eE]+)`, 'm').exec(stdout)
    const v = m ? Number(m[1]) : NaN
    if (!Number.isFinite(v))
      throw new Error(`ngspice gave no ${n} for RL=${k.rl} IF=${k.ledCurrent} CL=${k.loadCap} RBE=${k.rbe ?? '-'}:\n${stdout.slice(-600)}`)
    return v
  }
  return { vlow: get('vlow'), vhigh: get('vhigh'), tphl: get('tphl'), tf: get('tf'), tplh: get('tplh'), tr: get('tr') }
}

/** Run the cases, `parallel` ngspice processes at a time, in order of the input. */
export async function runCouplerCases(cases: CouplerCase[], parallel = 2): Promise<CouplerMeasured[]> {
  const dir = mkdtempSync(join(tmpdir(), 'bitslack-coupler-'))
  const text = template()
  const out: CouplerMeasured[] = new Array(cases.length)
  let next = 0
  const worker = async () => {
    while (next < cases.length) {
      const i = next++
      const k = cases[i]!
      const file = join(dir, `case${i}.cir`)
      writeFileSync(file, couplerNetlist(k, text))
      const stdout = await new Promise<string>((resolve, reject) => {
        const p = spawn('ngspice', ['-b', file], { cwd: dir })
        let s = ''
        p.stdout.on('data', (d) => (s += d))
        p.on('error', (e) => reject(new Error(`ngspice could not run: ${e.message}`)))
        p.on('close', () => resolve(s))
      })
      out[i] = parse(stdout, k)
    }
  }
  try {
    await Promise.all(Array.from({ length: Math.max(1, parallel) }, worker))
    return out
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}

/** The trade's bench values for this class (common practice, no source): [low, high] seconds. */
export const BENCH_VALUES = [
  {
    at: { rl: 4700, ledCurrent: 10e-3, loadCap: 0 },
    label: '5 V, 4.7 kΩ, 10 mA',
    tphl: [1.5e-6, 2e-6],
    tplh: [25e-6, 25e-6],
    tr: [14e-6, 14e-6],
    tf: [2e-6, 2e-6],
  },
  {
    at: { rl: 1200, ledCurrent: 20e-3, loadCap: 0 },
    label: '5 V, 1.2 kΩ, 20 mA',
    tphl: [1.5e-6, 2e-6],
    tplh: [18e-6, 20e-6],
    tr: [4e-6, 4e-6],
    tf: [2e-6, 2e-6],
  },
] as const

/** Relative distance of a value from a [low, high] range (0 inside it). */
export function distanceFromRange(v: number, [lo, hi]: readonly [number, number]): number {
  return v < lo ? v / lo - 1 : v > hi ? v / hi - 1 : 0
}

/** The agreement grid of issue 11: 5 pull-ups x 3 LED currents x 2 loads x with and without RBE. */
export const AGREEMENT_GRID: CouplerCase[] = [470, 1000, 2200, 4700, 10000].flatMap((rl) =>
  [10e-3, 25e-3, 50e-3].flatMap((ledCurrent) =>
    [0, 1e-9].flatMap((loadCap) => [undefined, 220e3].map((rbe) => ({ rl, ledCurrent, loadCap, ...(rbe ? { rbe } : {}) }))),
  ),
)
