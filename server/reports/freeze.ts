/**
 * What a revision freezes, and how a stored revision is checked against today's engine.
 * Pure (no database, no Nitro): the domain code and the unit tests call the same functions.
 */
import type { Link } from '../../shared/schemas/link'
import type { FreezePullup } from '../../shared/schemas/report'
import type { PullupChoice, ResultDifference } from '../../shared/types/report'
import { analyzeParsedLink, parseLink, sweepPullup, type LinkAnalysis } from '../timing'

export interface FrozenAnalysis {
  input: Link
  result: LinkAnalysis
  verdict: LinkAnalysis['verdict']
  engineVersion: string
  assumptions: string[]
  pullup: PullupChoice | null
}

/**
 * The first phototransistor stage of a UART link, swept over E12 around its pull-up (a
 * decade below to a decade above), when the caller names no sweep.
 */
export function defaultPullup(link: Link): FreezePullup | null {
  if (link.protocol !== 'uart') return null
  for (const ch of link.channels) {
    const i = ch.stages.findIndex((s) => s.kind === 'phototransistor')
    const s = ch.stages[i]
    if (s && s.kind === 'phototransistor') return { channelId: ch.id, stageIndex: i, series: 'E12', rlMin: s.rl / 10, rlMax: s.rl * 10 }
  }
  return null
}

/** Analyse a link and record everything a revision keeps. */
export function freezeAnalysis(spec: unknown, pullup?: FreezePullup | null): FrozenAnalysis {
  const input = parseLink(spec)
  const result = analyzeParsedLink(input)
  const options = pullup === undefined ? defaultPullup(input) : pullup
  let choice: PullupChoice | null = null
  if (options) {
    const sweep = sweepPullup(input, options.channelId, options.stageIndex, {
      series: options.series,
      rlMin: options.rlMin,
      rlMax: options.rlMax,
      ...(options.overdrive !== undefined ? { overdrive: options.overdrive } : {}),
    })
    const stage = input.channels.find((c) => c.id === options.channelId)!.stages[options.stageIndex]!
    if (stage.kind === 'phototransistor') {
      const row = sweep.rows.findIndex((r) => Math.abs(r.rl - stage.rl) <= stage.rl * 1e-9)
      choice = { sweep, chosenRow: row >= 0 ? row : null, rl: stage.rl, rLed: stage.rLed ?? null }
    }
  }
  return { input, result, verdict: result.verdict, engineVersion: result.engineVersion, assumptions: result.assumptions, pullup: choice }
}

const REL = 1e-9

function numbersEqual(a: number, b: number) {
  if (a === b) return true
  return Math.abs(a - b) <= REL * Math.max(Math.abs(a), Math.abs(b))
}

/**
 * Every leaf that differs between two JSON values, by dotted path (numbers equal to a
 * relative 1e-9, so a JSONB round trip of a double never counts as a change).
 */
export function diffResults(stored: unknown, recomputed: unknown, limit = 200): { differences: ResultDifference[]; count: number } {
  const out: ResultDifference[] = []
  let count = 0
  const walk = (a: unknown, b: unknown, path: string) => {
    if (typeof a === 'number' && typeof b === 'number') {
      if (!numbersEqual(a, b)) add(path, a, b)
      return
    }
    if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') {
      if (a !== b) add(path, a, b)
      return
    }
    if (Array.isArray(a) !== Array.isArray(b)) return add(path, a, b)
    if (Array.isArray(a) && Array.isArray(b)) {
      const n = Math.max(a.length, b.length)
      for (let i = 0; i < n; i++) walk(a[i], b[i], `${path}[${i}]`)
      return
    }
    const ao = a as Record<string, unknown>
    const bo = b as Record<string, unknown>
    const keys = [...new Set([...Object.keys(ao), ...Object.keys(bo)])].sort()
    for (const k of keys) walk(ao[k], bo[k], path ? `${path}.${k}` : k)
  }
  const add = (path: string, a: unknown, b: unknown) => {
    count++
    if (out.length < limit) out.push({ path, stored: a === undefined ? null : a, recomputed: b === undefined ? null : b })
  }
  walk(stored, recomputed, '')
  return { differences: out, count }
}

/** Recompute a stored revision from its stored input with today's engine. */
export function recomputeRevision(storedInput: unknown, storedResult: LinkAnalysis) {
  const result = analyzeParsedLink(parseLink(storedInput))
  // JSON round trip, as the stored result went through JSONB (undefined keys dropped)
  const recomputed = JSON.parse(JSON.stringify(result)) as LinkAnalysis
  const { differences, count } = diffResults(storedResult, recomputed)
  return { recomputed, same: count === 0, differences, differenceCount: count }
}
