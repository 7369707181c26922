/** The UART frame: its sampled bits for a data value, and every data value enumerated into each bit's run-start and run-end cases. (timing-model.md section 2; the method is described in ../uart.ts) */
import type { Parity } from '../../../shared/types/analysis'

/** One way a bit's run can start (early side) or end (late side), with a data value that produces it. */
export interface FrameCase {
  /** bit index (0 = start bit) */
  bit: number
  /** position of the boundary in transmitter bit times from the start edge (the start of bit `pos`; the next start edge at the frame length) */
  pos: number
  /** the logical edge at that boundary rises */
  rising: boolean
  /** the boundary is the start bit's own falling edge (the sync edge) */
  sync: boolean
  /** smallest data value that produces this case */
  pattern: number
}

export interface FrameLayout {
  dataBits: number
  parity: Parity
  stopBits: number
  backToBack: boolean
  /** labels of the sampled bits: start, d0.., parity, stop */
  labels: string[]
  /** frame length in bit times (start + data + parity + stop bits) */
  frameBits: number
  early: FrameCase[][]
  late: FrameCase[][]
  /** per bit: some data value leaves its run without an end (idle line after the stop bit) */
  lateUnbounded: boolean[]
}

const layoutCache = new Map<string, FrameLayout>()

/** The parity bit that follows from a data value. */
export function parityBit(parity: Parity, value: number): number | null {
  if (parity === 'none') return null
  if (parity === 'mark') return 1
  if (parity === 'space') return 0
  let ones = 0
  for (let v = value; v; v >>>= 1) ones += v & 1
  return parity === 'even' ? ones & 1 : 1 - (ones & 1)
}

/**
 * The frame's bits for one data value: start (0), data LSB first, parity, first stop (1).
 * Only the sampled bits; the frame length is in FrameLayout.frameBits.
 */
export function frameBits(dataBits: number, parity: Parity, value: number): number[] {
  const bits = [0]
  for (let i = 0; i < dataBits; i++) bits.push((value >>> i) & 1)
  const p = parityBit(parity, value)
  if (p !== null) bits.push(p)
  bits.push(1)
  return bits
}

/** Enumerate every data value of a frame format into each bit's run-start and run-end cases (cached). */
export function frameLayout(dataBits: number, parity: Parity, stopBits: number, backToBack: boolean): FrameLayout {
  const key = `${dataBits}|${parity}|${stopBits}|${backToBack}`
  const hit = layoutCache.get(key)
  if (hit) return hit
  const labels = ['start', ...Array.from({ length: dataBits }, (_, i) => `d${i}`), ...(parity === 'none' ? [] : ['parity']), 'stop']
  const K = labels.length - 1
  const frameLen = 1 + dataBits + (parity === 'none' ? 0 : 1) + stopBits
  const early: Map<string, FrameCase>[] = labels.map(() => new Map())
  const late: Map<string, FrameCase>[] = labels.map(() => new Map())
  const lateUnbounded = labels.map(() => false)
  for (let v = 0; v < 1 << dataBits; v++) {
    const b = frameBits(dataBits, parity, v)
    for (let k = 0; k <= K; k++) {
      let a = k
      while (a > 0 && b[a - 1] === b[k]) a--
      const rising = b[k] === 1
      const ek = `${a}|${b[k]}`
      if (!early[k]!.has(ek)) early[k]!.set(ek, { bit: k, pos: a, rising: a > 0 && rising, sync: a === 0, pattern: v })
      let e = k + 1
      while (e <= K && b[e] === b[k]) e++
      if (e <= K) {
        if (!late[k]!.has(`${e}|${b[k]}`)) late[k]!.set(`${e}|${b[k]}`, { bit: k, pos: e, rising: b[k] === 0, sync: false, pattern: v })
      } else if (backToBack) {
        // the run reaches the stop bit and ends at the next frame's start edge (falling)
        if (!late[k]!.has('next')) late[k]!.set('next', { bit: k, pos: frameLen, rising: false, sync: false, pattern: v })
      } else lateUnbounded[k] = true
    }
  }
  const layout: FrameLayout = {
    dataBits,
    parity,
    stopBits,
    backToBack,
    labels,
    frameBits: frameLen,
    early: early.map((m) => [...m.values()]),
    late: late.map((m) => [...m.values()]),
    lateUnbounded,
  }
  layoutCache.set(key, layout)
  return layout
}
