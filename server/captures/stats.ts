import type { SummaryStats } from '../../shared/types/capture'
export type { SummaryStats }


/**
 * Running statistics by Welford's update (numerically stable for many close values,
 * common practice). `result()` is null while empty, so no NaN ever leaves here.
 */
export class RunningStats {
  private n = 0
  private m = 0
  private s = 0
  private lo = Infinity
  private hi = -Infinity

  push(x: number): void {
    this.n++
    const d = x - this.m
    this.m += d / this.n
    this.s += d * (x - this.m)
    if (x < this.lo) this.lo = x
    if (x > this.hi) this.hi = x
  }

  get count(): number {
    return this.n
  }

  result(): SummaryStats | null {
    if (this.n === 0) return null
    return {
      count: this.n,
      min: this.lo,
      mean: this.m,
      max: this.hi,
      sigma: this.n > 1 ? Math.sqrt(Math.max(0, this.s / (this.n - 1))) : 0,
    }
  }
}

/** Summary statistics of `values`, or null when there are none. */
export function summarise(values: Iterable<number>): SummaryStats | null {
  const r = new RunningStats()
  for (const v of values) r.push(v)
  return r.result()
}
