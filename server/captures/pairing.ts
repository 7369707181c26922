import type { Edge, Polarity } from './transitions'
import { RunningStats, type SummaryStats } from './stats'
import type { EdgePair, Pairing } from '../../shared/types/capture'
export type { EdgePair, Pairing }



const flip = (p: Polarity): Polarity => (p === 'rising' ? 'falling' : 'rising')

/** Index of the first edge in `edges` whose t50 is after `t` (binary search; edges are in time order). */
function firstAfter(edges: readonly Edge[], t: number, from = 0): number {
  let a = from
  let b = edges.length
  while (a < b) {
    const m = (a + b) >> 1
    if (edges[m]!.t50 > t) b = m
    else a = m + 1
  }
  return a
}

/**
 * Whether the path inverts, judged from the data: for each input edge, the first output
 * edge after it has the same direction (non-inverting) or the opposite one (inverting);
 * the majority decides.
 */
export function detectInversion(input: readonly Edge[], output: readonly Edge[]): { inverting: boolean; agreement: number } | null {
  let same = 0
  let opposite = 0
  for (const e of input) {
    const j = firstAfter(output, e.t50)
    if (j >= output.length) continue
    if (output[j]!.polarity === e.polarity) same++
    else opposite++
  }
  if (same + opposite === 0) return null
  return { inverting: opposite > same, agreement: Math.max(same, opposite) / (same + opposite) }
}

/**
 * Pair every input edge with the output edge that follows it (timing-model.md section 6):
 * the first not yet paired output edge of the expected direction (the input's direction,
 * or the opposite one through an inverting path) after the input's 50 % instant and
 * before the next input edge of the same direction, so that one missing output edge does
 * not shift every later pair. Delays are 50 % to 50 %, classified tPLH / tPHL by the
 * output's direction (JEDEC convention, timing-model.md section 1).
 */
export function pairEdges(input: readonly Edge[], output: readonly Edge[], options: { inverting?: boolean } = {}): Pairing {
  let inverting = options.inverting ?? false
  let agreement: number | null = null
  if (options.inverting === undefined) {
    const d = detectInversion(input, output)
    if (d) {
      inverting = d.inverting
      agreement = d.agreement
    }
  }
  const plh = new RunningStats()
  const phl = new RunningStats()
  const pairs: EdgePair[] = []
  let unpaired = 0
  let j = 0
  for (let i = 0; i < input.length; i++) {
    const e = input[i]!
    const want = inverting ? flip(e.polarity) : e.polarity
    let nextSame = Infinity
    for (let k = i + 1; k < input.length; k++) {
      if (input[k]!.polarity === e.polarity) {
        nextSame = input[k]!.t50
        break
      }
    }
    j = firstAfter(output, e.t50, j)
    let k = j
    while (k < output.length && output[k]!.polarity !== want && output[k]!.t50 < nextSame) k++
    if (k < output.length && output[k]!.polarity === want && output[k]!.t50 < nextSame) {
      const o = output[k]!
      const delay = o.t50 - e.t50
      const kind = o.polarity === 'rising' ? 'tPLH' : 'tPHL'
      pairs.push({ input: e.t50, output: o.t50, delay, kind })
      ;(kind === 'tPLH' ? plh : phl).push(delay)
      j = k + 1
    } else unpaired++
  }
  const tPLH = plh.result()
  const tPHL = phl.result()
  return {
    inverting,
    inversionSource: options.inverting === undefined ? 'detected' : 'given',
    inversionAgreement: agreement,
    pairs,
    tPLH,
    tPHL,
    pwd: tPLH && tPHL ? tPLH.mean - tPHL.mean : null,
    unpairedInputEdges: unpaired,
  }
}
