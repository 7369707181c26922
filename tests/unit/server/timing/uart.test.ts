import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { analyzeLink } from '../../../../server/timing/analyze'
import { analyzeUartChannel, frameBits, frameLayout, type ReceiverEnd, type UartChannelInput } from '../../../../server/timing/uart'
import { digital, ns, uartLink } from './fixtures'

type Parity = 'none' | 'even' | 'odd' | 'mark' | 'space'

/** A direction with no distortion and exact clocks unless given. */
function channel(over: Omit<Partial<UartChannelInput>, 'rx'> & { rx?: Partial<ReceiverEnd> } = {}) {
  const { rx, ...rest } = over
  return analyzeUartChannel({
    channelId: 'a2b',
    settings: { baud: 115200, dataBits: 8, parity: 'none', stopBits: 1, backToBack: true, requiredMarginUi: 0, berTarget: 1e-12 },
    tx: { errorPpm: 0 },
    rx: { errorPpm: 0, sampler: 'ticks', oversampling: 16, sampleTicks: [7, 8, 9], vote: 'majority', samplePoint: 0.5, ...rx },
    chain: { pwd: { min: 0, max: 0 }, jitterPeak: 0, jitterRms: 0 },
    receiverInvert: false,
    ...rest,
  })
}

/** D = character size + parity (5..10) as a frame: 9 data + parity for D = 10. */
const frameFor = (D: number): { dataBits: number; parity: Parity } => (D <= 9 ? { dataBits: D, parity: 'none' } : { dataBits: 9, parity: 'even' })

const tolOf = (D: number, S: number, vote: 'all' | 'majority' | 'single', ticks: number[]) =>
  channel({
    settings: { baud: 9600, ...frameFor(D), stopBits: 1, backToBack: true, requiredMarginUi: 0, berTarget: 1e-12 },
    rx: { oversampling: S, sampleTicks: ticks, vote },
  }).clockTolerance

describe('receiver tolerance to clock deviation with zero distortion', () => {
  // references.md 1.3: ATmega8A datasheet Tables 24-2 (normal speed) and 24-3 (double speed),
  // Rslow / Rfast in percent, printed to two decimals. Mapping (references.md, top):
  // Rslow = vote 'all', Rfast = vote 'majority', ticks 7,8,9 (16x) or 3,4,5 (8x).
  const normal: [number, number, number][] = [
    [5, 93.2, 106.67], [6, 94.12, 105.79], [7, 94.81, 105.11], [8, 95.36, 104.58], [9, 95.81, 104.14], [10, 96.17, 103.78],
  ]
  const double: [number, number, number][] = [
    [5, 94.12, 105.66], [6, 94.92, 104.92], [7, 95.52, 104.35], [8, 96.0, 103.9], [9, 96.39, 103.53], [10, 96.7, 103.23],
  ]

  it('16x, ticks 7, 8, 9: Rslow and Rfast of ATmega8A Table 24-2', () => {
    for (const [D, rslow, rfast] of normal) {
      expect(Math.abs(tolOf(D, 16, 'all', [7, 8, 9]).slowest! * 100 - rslow)).toBeLessThanOrEqual(0.0051)
      expect(Math.abs(tolOf(D, 16, 'majority', [7, 8, 9]).fastest! * 100 - rfast)).toBeLessThanOrEqual(0.0051)
    }
  })

  it('8x, ticks 3, 4, 5: Rslow and Rfast of ATmega8A Table 24-3', () => {
    for (const [D, rslow, rfast] of double) {
      expect(Math.abs(tolOf(D, 8, 'all', [3, 4, 5]).slowest! * 100 - rslow)).toBeLessThanOrEqual(0.0051)
      expect(Math.abs(tolOf(D, 8, 'majority', [3, 4, 5]).fastest! * 100 - rfast)).toBeLessThanOrEqual(0.0051)
    }
  })

  it('exact ratios: Rslow = S(D+1)/(S(D+1)+SF-1), Rfast = S(D+2)/(S(D+1)+SM)', () => {
    // references.md 1.3 formula (SF 8 / 4, SM 9 / 5); issue 3: 144/151 and 160/153 for an 8-bit frame
    expect(tolOf(8, 16, 'all', [7, 8, 9]).slowest).toBeCloseTo(144 / 151, 14)
    expect(tolOf(8, 16, 'majority', [7, 8, 9]).fastest).toBeCloseTo(160 / 153, 14)
    expect(tolOf(8, 8, 'all', [3, 4, 5]).slowest).toBeCloseTo(72 / 75, 14) // references.md 1.3: exact 72/75
    for (const D of [5, 6, 7, 9, 10]) {
      expect(tolOf(D, 16, 'all', [7, 8, 9]).slowest).toBeCloseTo((16 * (D + 1)) / (16 * (D + 1) + 7), 14)
      expect(tolOf(D, 16, 'majority', [7, 8, 9]).fastest).toBeCloseTo((16 * (D + 2)) / (16 * (D + 1) + 9), 14)
      expect(tolOf(D, 8, 'all', [3, 4, 5]).slowest).toBeCloseTo((8 * (D + 1)) / (8 * (D + 1) + 3), 14)
      expect(tolOf(D, 8, 'majority', [3, 4, 5]).fastest).toBeCloseTo((8 * (D + 2)) / (8 * (D + 1) + 5), 14)
    }
    // a parity bit counts in D exactly like a data bit: 7 data + parity = D 8
    const p = channel({ settings: { baud: 9600, dataBits: 7, parity: 'odd', stopBits: 1, backToBack: true, requiredMarginUi: 0, berTarget: 1e-12 }, rx: { vote: 'all' } })
    expect(p.clockTolerance.slowest).toBeCloseTo(144 / 151, 14)
  })

  it('the STM32 tables are conservative: the exact tolerance is at least the printed value', () => {
    // references.md 1.2: RM0351 Table 194 / RM0399 Table 421 (BRR[3:0] = 0000); total deviation, %
    // frame N = 10 (8 data), 11 (9 data), 9 (7 data); 3-sample = majority of the 3 middle ticks, 1-sample = the middle tick
    const rows: [number, number, number, number, number][] = [
      // N, OS16 3-sample, OS16 1-sample, OS8 3-sample, OS8 1-sample
      [10, 3.75, 4.375, 2.5, 3.75],
      [11, 3.41, 3.97, 2.27, 3.41],
      [9, 4.16, 4.86, 2.77, 4.16],
    ]
    for (const [N, os16v, os16s, os8v, os8s] of rows) {
      const D = N - 2
      const dev = (t: { slowest: number | null; fastest: number | null }) => Math.min(1 - t.slowest!, t.fastest! - 1) * 100
      expect(dev(tolOf(D, 16, 'majority', [7, 8, 9]))).toBeGreaterThanOrEqual(os16v)
      expect(dev(tolOf(D, 16, 'single', [8]))).toBeGreaterThanOrEqual(os16s)
      expect(dev(tolOf(D, 8, 'majority', [3, 4, 5]))).toBeGreaterThanOrEqual(os8v)
      expect(dev(tolOf(D, 8, 'single', [4]))).toBeGreaterThanOrEqual(os8s)
    }
  })

  it('an ideal mid-bit sampler tolerates +-1/2 bit over the 9.5 bits to the stop-bit centre', () => {
    // references.md 1.6: Circuit Cellar EQ 296, 10-bit frame -> +-5.263 % total
    const t = channel({ rx: { sampler: 'ideal', samplePoint: 0.5 } }).clockTolerance
    expect((1 - t.slowest!) * 100).toBeCloseTo(5.263, 3)
    expect((t.fastest! - 1) * 100).toBeCloseTo(5.263, 3)
  })

  it('the tolerance is where the per-bit margins reach zero under a clock error', () => {
    // timing-model.md section 2: the clock tolerance and the margins are one model
    for (const vote of ['all', 'majority'] as const) {
      const tol = channel({ rx: { vote } }).clockTolerance
      const e = Math.min(1 - tol.slowest!, tol.fastest! - 1)
      const at = (ppm: number) => channel({ tx: { errorPpm: ppm }, rx: { vote } }).worstMarginUi
      expect(at(e * 1e6 * 0.999)).toBeGreaterThanOrEqual(0)
      expect(at(e * 1e6 * 1.001)).toBeLessThan(0)
    }
  })
})

describe('per-bit margins', () => {
  it('labels, null late margin on an idle line, stop run ending at the next start when back to back', () => {
    const idle = channel({ settings: { baud: 9600, dataBits: 7, parity: 'even', stopBits: 2, backToBack: false, requiredMarginUi: 0, berTarget: 1e-12 } })
    expect(idle.bits.map((b) => b.label)).toEqual(['start', 'd0', 'd1', 'd2', 'd3', 'd4', 'd5', 'd6', 'parity', 'stop'])
    expect(idle.bits[9]!.lateMargin).toBeNull() // timing-model.md 2: a run that never ends has no bound -> null
    expect(idle.bits[9]!.earlyMargin).not.toBeNull()
    const b2b = channel({ settings: { baud: 9600, dataBits: 7, parity: 'even', stopBits: 2, backToBack: true, requiredMarginUi: 0, berTarget: 1e-12 } })
    // the stop run ends at the next start edge, 1 + 7 + 1 + 2 = 11 bit times after the sync edge
    expect(b2b.bits[9]!.lateMargin! / b2b.bitTime).toBeCloseTo(11 - (9 + 8 / 16 + 1 / 16), 12)
  })

  it('a PWD shortens the 1 bits: the worst pattern is an isolated 1 and the limit is asymmetry', () => {
    // references.md 8.3: PWD = |tPHL - tPLH|; as a percent of the minimum pulse width
    const pwd = 0.2 / 115200 // 20 % of a bit
    const r = channel({ chain: { pwd: { min: pwd, max: pwd }, jitterPeak: 0, jitterRms: 0 } })
    const d3 = r.bits[4]!
    // with exact clocks the early side of an isolated 1 loses the whole PWD: 7/16 UI (ticks 7,8,9 majority -> tick 8, minus 1/16 sampling) ...
    expect(d3.earlyMarginUi).toBeCloseTo(0.5 - 0.2, 12)
    expect(d3.limitedBy).toBe('asymmetry')
    // ... and the worst pattern has d3 = 1 preceded by a 0
    const bits = frameBits(8, 'none', d3.worstPattern)
    expect(bits[4]).toBe(1)
    expect(bits[3]).toBe(0)
  })

  it('jitter of an edge and of the sync edge both count in the worst case', () => {
    const j = 1e-6 // 0.115 UI per edge at 115200 baud: twice that outweighs the 2/16 UI of sampling
    const r = channel({ chain: { pwd: { min: 0, max: 0 }, jitterPeak: j, jitterRms: 0 } })
    const base = channel()
    expect((base.bits[4]!.lateMargin! - r.bits[4]!.lateMargin!) / j).toBeCloseTo(2, 9)
    expect(r.bits[0]!.earlyMargin).toBeCloseTo(base.bits[0]!.earlyMargin, 15) // the sync edge is the reference of the start bit
    expect(r.bits[4]!.limitedBy).toBe('jitter')
  })

  it('the maximum baud is the rate where the worst margin meets the requirement', () => {
    const pwd = 50 * ns
    const r = channel({
      settings: { baud: 115200, dataBits: 8, parity: 'none', stopBits: 1, backToBack: true, requiredMarginUi: 0.1, berTarget: 1e-12 },
      tx: { errorPpm: 5000 },
      rx: { errorPpm: 5000 },
      chain: { pwd: { min: -pwd, max: pwd }, jitterPeak: 5 * ns, jitterRms: 1 * ns },
    })
    expect(r.maxBaud).not.toBeNull()
    const at = (baud: number) =>
      channel({
        settings: { baud, dataBits: 8, parity: 'none', stopBits: 1, backToBack: true, requiredMarginUi: 0.1, berTarget: 1e-12 },
        tx: { errorPpm: 5000 },
        rx: { errorPpm: 5000 },
        chain: { pwd: { min: -pwd, max: pwd }, jitterPeak: 5 * ns, jitterRms: 1 * ns },
      }).worstMarginUi
    expect(at(r.maxBaud! * 0.999)).toBeGreaterThanOrEqual(0.1)
    expect(at(r.maxBaud! * 1.001)).toBeLessThan(0.1)
    expect(r.maxBaudLimitedBy).not.toBeNull()
  })

  it('without distortion the maximum baud is the cap, with a note; with too much clock error nothing passes', () => {
    const capped = channel()
    expect(capped.maxBaudCapped).toBe(true)
    expect(capped.maxBaud).toBe(capped.maxBaudCap)
    expect(capped.maxBaudNote).toMatch(/cap/)
    const none = channel({ tx: { errorPpm: 60000 } })
    expect(none.maxBaud).toBeNull()
    expect(none.verdict).toBe('fail')
  })

  it('standard rates carry each rate\'s own generator divisor and error', () => {
    const r = channel({ rx: { clockHz: 16e6, fractionBits: 0 } })
    const row = r.standardRates.find((s) => s.baud === 115200)!
    expect(row.divisor).toBe(9) // references.md 1.8 [D]: AVR UBRR 8 at 16 MHz
    expect(row.error! * 100).toBeCloseTo(-3.549, 3)
    expect(r.standardRates.map((s) => s.baud)[0]).toBe(1200)
    expect(r.standardRates.at(-1)!.baud).toBe(3000000)
    // the receiver 3.5 % slow still decodes with 16x majority sampling (fastest 160/153, references.md 1.3)
    expect(row.pass).toBe(true)
    const row2 = r.standardRates.find((s) => s.baud === 230400)!
    expect(row2.divisor).toBe(4) // 16e6 / (16 * 230400) = 4.34 -> 4, +8.5 %: fails
    expect(row2.pass).toBe(false)
  })

  it('verdicts: pass at the required margin, marginal below it, fail below zero', () => {
    const at = (req: number, ppm: number) =>
      channel({ settings: { baud: 9600, dataBits: 8, parity: 'none', stopBits: 1, backToBack: true, requiredMarginUi: req, berTarget: 1e-12 }, tx: { errorPpm: ppm } })
    expect(at(0.1, 0).verdict).toBe('pass')
    expect(at(0.45, 0).verdict).toBe('marginal')
    expect(at(0.1, 60000).verdict).toBe('fail')
  })
})

/**
 * Independent brute force: build the received waveform of every data value at the
 * corners of the clocks, the PWD and the detection latency, sample it as the receiver
 * does and vote; compare with the engine's sign of the worst margin.
 */
function bruteDecodes(o: {
  dataBits: number
  parity: Parity
  stopBits: 1 | 1.5 | 2
  backToBack: boolean
  N: number
  ticks: number[]
  vote: 'single' | 'majority' | 'all'
  txPpm: number
  rxPpm: number
  pwd: [number, number]
  baud: number
}): boolean {
  const T = 1 / o.baud
  const K = o.dataBits + (o.parity === 'none' ? 0 : 1) + 1
  const F = K + o.stopBits
  for (let v = 0; v < 1 << o.dataBits; v++) {
    const b = frameBits(o.dataBits, o.parity, v)
    for (const ttx of [T / (1 + o.txPpm * 1e-6), T / (1 - o.txPpm * 1e-6)])
      for (const trx of [T / (1 + o.rxPpm * 1e-6), T / (1 - o.rxPpm * 1e-6)])
        for (const P of [o.pwd[0], o.pwd[1], 0])
          for (const lf of [0, 0.5, 1 - 1e-9]) {
            const L = (lf * trx) / o.N
            // edges (time, new level) after the sync edge at 0
            const edges: [number, number][] = []
            for (let j = 1; j <= K; j++) if (b[j] !== b[j - 1]) edges.push([j * ttx + (b[j] === 1 ? P : 0), b[j]!])
            if (o.backToBack) edges.push([F * ttx, 0])
            const level = (t: number) => {
              let lv = 0
              for (const [te, nv] of edges) if (te <= t) lv = nv
              return lv
            }
            for (let k = 0; k <= K; k++) {
              const seen = o.ticks.map((s) => level(L + ((k * o.N + s) * trx) / o.N))
              const ones = seen.filter((x) => x === 1).length
              const got = o.vote === 'all' ? (ones === seen.length ? 1 : ones === 0 ? 0 : -1) : ones * 2 > seen.length ? 1 : 0
              if (got !== b[k]) return false
            }
          }
  }
  return true
}

describe('agreement with a brute-force receiver', () => {
  it('the worst margin is positive exactly when every data value decodes at every corner', () => {
    const cfg = fc.record({
      dataBits: fc.integer({ min: 5, max: 8 }),
      parity: fc.constantFrom<Parity>('none', 'even', 'odd', 'mark', 'space'),
      stopBits: fc.constantFrom<1 | 1.5 | 2>(1, 1.5, 2),
      backToBack: fc.boolean(),
      sampler: fc.constantFrom(
        { N: 16, ticks: [7, 8, 9] as number[], vote: 'majority' as const },
        { N: 16, ticks: [7, 8, 9] as number[], vote: 'all' as const },
        { N: 16, ticks: [8] as number[], vote: 'single' as const },
        { N: 8, ticks: [3, 4, 5] as number[], vote: 'majority' as const },
      ),
      txPpm: fc.integer({ min: 0, max: 60000 }),
      rxPpm: fc.integer({ min: 0, max: 60000 }),
      pwdUi: fc.tuple(fc.double({ min: -0.25, max: 0.25, noNaN: true }), fc.double({ min: 0, max: 0.25, noNaN: true })),
    })
    fc.assert(
      fc.property(cfg, (c) => {
        const baud = 10000
        const pwd: [number, number] = [c.pwdUi[0] / baud, (c.pwdUi[0] + c.pwdUi[1]) / baud]
        const r = channel({
          settings: { baud, dataBits: c.dataBits, parity: c.parity, stopBits: c.stopBits, backToBack: c.backToBack, requiredMarginUi: 0, berTarget: 1e-12 },
          tx: { errorPpm: c.txPpm },
          rx: { errorPpm: c.rxPpm, oversampling: c.sampler.N, sampleTicks: c.sampler.ticks, vote: c.sampler.vote },
          chain: { pwd: { min: pwd[0], max: pwd[1] }, jitterPeak: 0, jitterRms: 0 },
        })
        fc.pre(Math.abs(r.worstMarginUi) > 1e-6)
        const ok = bruteDecodes({ ...c, ...c.sampler, pwd, baud })
        expect(ok).toBe(r.worstMarginUi > 0)
      }),
      { numRuns: 60, seed: 3 },
    )
  })
})

describe('frame enumeration', () => {
  it('parity follows the data value', () => {
    // common practice: even parity makes the count of ones (data + parity) even
    expect(frameBits(8, 'even', 0b1011)).toEqual([0, 1, 1, 0, 1, 0, 0, 0, 0, 1, 1])
    expect(frameBits(8, 'odd', 0b1011)).toEqual([0, 1, 1, 0, 1, 0, 0, 0, 0, 0, 1])
    expect(frameBits(5, 'mark', 0)).toEqual([0, 0, 0, 0, 0, 0, 1, 1])
    const l = frameLayout(8, 'none', 1, true)
    expect(l.frameBits).toBe(10)
    // the start bit always begins at the sync edge
    expect(l.early[0]!.every((c) => c.sync)).toBe(true)
  })

  it('the full analysis of a link is fast', () => {
    const link = uartLink([digital(30 * ns, 20 * ns)], { parity: 'even', dataBits: 9 })
    analyzeLink(link)
    const t0 = performance.now()
    for (let i = 0; i < 50; i++) analyzeLink(link)
    expect((performance.now() - t0) / 50).toBeLessThan(20) // generous: the goal is well under 1 ms, the machine is shared
  })
})

describe('statistical view of the asymmetry', () => {
  it('root-sum-square of many stages is narrower than the interval sum, so its margin is at least the worst case', () => {
    // timing-model.md section 1: the statistical view adds the spreads as root-sum-square (min/max = +-3 sigma)
    const c = { min: 20 * ns, typ: 40 * ns, max: 60 * ns }
    const stage = { ...digital(0, 0), tplh: c, tphl: c }
    const result = analyzeLink(uartLink([stage, stage, stage, stage], { baud: 2e6 }))
    const r = result.uart!
    const ch = result.channels[0]!
    // four equal spreads: RSS = half the linear sum
    expect(ch.pwdSigma * 3).toBeCloseTo((ch.pwd.max - ch.pwd.min) / 4, 15)
    expect(r.statistical!.pwd.max).toBeCloseTo(ch.pwd.max / 2, 15)
    expect(r.statistical!.worstMarginUi).toBeGreaterThan(r.worstMarginUi)
  })
})
