/**
 * ngspice batch runs of the RC part of a stage's output edge, shared by the reference
 * test and the benchmark: the switch is ideal (it opens at t = 0), so a pull-up R
 * charges the load C from vLow towards vHigh (passive rise), and an emitter-style
 * resistor discharges it from vHigh towards 0 (passive fall). Each named level is
 * timed with `.meas tran NAME WHEN v(node)=V RISE=1` (or FALL=1).
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

export interface RcEdgeCase {
  r: number
  c: number
  /** start level of the rising edge and its supply, volts */
  vLow: number
  vHigh: number
  /** crossing levels to time, volts, by name: rising edge (node outr) */
  riseLevels: Record<string, number>
  /** crossing levels to time, volts, by name: falling edge from vHigh to 0 (node outf) */
  fallLevels: Record<string, number>
  /** maximum time step as a fraction of tau: tau / stepsPerTau (default 2000) */
  stepsPerTau?: number
}

/** Measured crossing times after the switch opens, seconds, by level name. */
export interface RcEdgeMeasured {
  rise: Record<string, number>
  fall: Record<string, number>
}

/** The ngspice version line, or null when ngspice is not on the PATH. */
export function ngspiceVersion(): string | null {
  const r = spawnSync('ngspice', ['-v'], { encoding: 'utf8' })
  if (r.error || r.status !== 0) return null
  const line = r.stdout.split('\n').find((l) => /ngspice/i.test(l))
  return (line ?? 'ngspice').trim()
}

/** Throw a plain message when ngspice is missing. */
export function requireNgspice(): string {
  const v = ngspiceVersion()
  if (v === null)
    throw new Error('ngspice is not installed: the RC reference checks need it (apt-get install -y ngspice; npm test installs it when missing)')
  return v
}

const name = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '')

/** The netlist of one case (both edges, one transient). */
export function rcEdgeNetlist(k: RcEdgeCase): string {
  const tau = k.r * k.c
  const step = tau / (k.stepsPerTau ?? 2000)
  const lines = [
    `* RC edge R=${k.r} C=${k.c}`,
    `Vcc vcc 0 ${k.vHigh}`,
    `R1 vcc outr ${k.r}`,
    `C1 outr 0 ${k.c} IC=${k.vLow}`,
    `R2 outf 0 ${k.r}`,
    `C2 outf 0 ${k.c} IC=${k.vHigh}`,
    // run to 8 tau (0.03 % of the swing left) with the step held below tau / stepsPerTau
    `.tran ${step} ${8 * tau} 0 ${step} uic`,
  ]
  for (const [n, v] of Object.entries(k.riseLevels)) lines.push(`.meas tran r_${name(n)} WHEN v(outr)=${v} RISE=1`)
  for (const [n, v] of Object.entries(k.fallLevels)) lines.push(`.meas tran f_${name(n)} WHEN v(outf)=${v} FALL=1`)
  lines.push('.end', '')
  return lines.join('\n')
}

/**
 * Run each netlist in its own `ngspice -b` process; every `.meas` result by its (lower-case)
 * name. A measurement ngspice could not make is absent from the map; the output is kept for
 * the caller's message.
 */
export function runMeasures(netlists: string[]): { values: Map<string, number>; output: string }[] {
  const dir = mkdtempSync(join(tmpdir(), 'bitslack-ngspice-'))
  try {
    return netlists.map((netlist, i) => {
      const file = join(dir, `case${i}.cir`)
      writeFileSync(file, netlist)
      const r = spawnSync('ngspice', ['-b', file], { encoding: 'utf8', cwd: dir })
      if (r.error) throw new Error(`ngspice could not run: ${r.error.message}`)
      const values = new Map<string, number>()
      for (const m of r.stdout.matchAll(/^\s*([a-z][a-z0-9_]*)\s*=\s*([-+0-9.eE]+)/gm)) if (Number.isFinite(Number(m[2]))) values.set(m[1]!, Number(m[2]))
      return { values, output: `${r.stdout.slice(-800)}${r.stderr.slice(-400)}` }
    })
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}

/** Run each case in its own `ngspice -b` process and parse the measurements. */
export function runRcEdges(cases: RcEdgeCase[]): RcEdgeMeasured[] {
  const runs = runMeasures(cases.map(rcEdgeNetlist))
  return cases.map((k, i) => {
    const { values, output } = runs[i]!
    const pick = (prefix: 'r' | 'f', levels: Record<string, number>) => {
      const out: Record<string, number> = {}
      for (const n of Object.keys(levels)) {
        const v = values.get(`${prefix}_${name(n)}`)
        if (v === undefined) throw new Error(`ngspice gave no measurement ${prefix}_${name(n)} for R=${k.r} C=${k.c}:\n${output}`)
        out[n] = v
      }
      return out
    }
    return { rise: pick('r', k.riseLevels), fall: pick('f', k.fallLevels) }
  })
}
