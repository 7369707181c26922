import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { LinkSpec, type Link, type LinkInput } from '../../../../shared/schemas/link'
import { analyzeLink } from '../../../../server/timing/analyze'
import { analyzeSpi, SPI_CHECK_IDS, type SpiResult } from '../../../../server/timing/spi'
import type { ChainResult } from '../../../../server/timing/types'

const ns = 1e-9
const MHz = 1e6

type Tri = [number, number, number]
/** A hand-built chain result (the chain module is tested on its own). */
function chain(id: string, role: string, rise: Tri, fall: Tri, extra: Partial<ChainResult> = {}): ChainResult {
  const r = { min: rise[0], typ: rise[1], max: rise[2] }
  const f = { min: fall[0], typ: fall[1], max: fall[2] }
  return {
    id,
    role,
    rise: r,
    fall: f,
    pwd: { min: r.min - f.max, max: r.max - f.min },
    pwdSigma: 0,
    polarity: 'kept',
    tr: { typ: 1 * ns, max: 1 * ns },
    tf: { typ: 1 * ns, max: 1 * ns },
    riseShape: 'ramp',
    fallShape: 'ramp',
    jitterRms: 0,
    jitterPeak: 0,
    partSkew: 0,
    warnings: [],
    ...extra,
  }
}
const flat = (t: number): Tri => [t, t, t]

const receiver = { vdd: 3.3, vih: 2, vil: 0.8 }
function spiLink(spi: Partial<NonNullable<LinkInput['spi']>> & { peripheral?: object; controller?: object }, withCs = true): Link {
  const input: LinkInput = {
    schemaVersion: 1,
    name: 'isolated ADC link',
    protocol: 'spi',
    channels: [
      { id: 'sclk', role: 'sclk', stages: [], receiver },
      { id: 'mosi', role: 'mosi', stages: [], receiver },
      { id: 'miso', role: 'miso', stages: [], receiver },
      ...(withCs ? [{ id: 'cs', role: 'cs' as const, stages: [], receiver }] : []),
    ],
    spi: {
      sclkHz: 1 * MHz,
      cpol: 0,
      cpha: 0,
      controller: {},
      peripheral: { clockToOut: { min: 0, max: 0 } },
      ...spi,
    } as NonNullable<LinkInput['spi']>,
  }
  return LinkSpec.parse(input)
}
/** All four channels through isolator channels of one propagation delay. */
function isoChains(tpd: number): ChainResult[] {
  return ['sclk', 'mosi', 'miso', 'cs'].map((id) => chain(id, id, flat(tpd), flat(tpd)))
}
const check = (r: SpiResult, id: string) => r.checks.find((c) => c.id === id)!

describe('analyzeSpi: maximum SCLK against published isolated-SPI numbers', () => {
  // references.md 2.1: isolator-only bound 2*tpd < T/2, fmax = 1/(4 tpd)
  it.each([
    // [tpd, printed MHz, source]
    [16 * ns, 15.6], // references.md 2.2, TI E2E FAQ "maximum SPI speed supported by a digital isolator", 16 ns example: 15.6 MHz
    [9 * ns, 27.75], // references.md 2.2, TI E2E FAQ, 9 ns example: 27.75 MHz (printed slightly off)
    [36 * ns, 6.9], // references.md 2.2, ADI EngineerZone answer, 36 ns at 3.3 V: 6.9 MHz
    [32 * ns, 7.8], // references.md 2.2, ADI EngineerZone answer, 32 ns: 7.8 MHz
  ])('tpd %s s gives the printed %s MHz', (tpd, printed) => {
    const r = analyzeSpi(spiLink({}), isoChains(tpd))
    expect(r.maxSclkHz! / MHz).toBeCloseTo(1 / (4 * tpd) / MHz, 9) // exact formula
    expect(Math.abs(r.maxSclkHz! / MHz - printed)).toBeLessThanOrEqual(0.05) // rounded print, +-0.05 MHz
    expect(r.limitingCheck).toBe('miso-setup')
  })

  it('needs tpd below 5.56 ns for 45 MHz', () => {
    // references.md 2.2, ADI "Fast SPI connections through isolation": "less than 5.5 ns" for 45 MHz
    expect(analyzeSpi(spiLink({}), isoChains(5.5 * ns)).maxSclkHz!).toBeGreaterThan(45 * MHz)
    expect(analyzeSpi(spiLink({}), isoChains(5.6 * ns)).maxSclkHz!).toBeLessThan(45 * MHz)
  })

  it('full loop: forward 16 ns, clock-to-out 10 ns, return 16 ns, setup 5 ns gives 10.638 MHz', () => {
    // references.md 2.1, TI datasheet SBAS707B loop formula fmax = 1/(2 td_total); 2.2 [D] 10.638 MHz
    const link = spiLink({ controller: { misoSetup: 5 * ns }, peripheral: { clockToOut: { min: 10 * ns, max: 10 * ns } } })
    const r = analyzeSpi(link, isoChains(16 * ns))
    expect(r.maxSclkHz! / MHz).toBeCloseTo(1 / (2 * 47 * ns) / MHz, 9)
    expect(r.maxSclkHz! / MHz).toBeCloseTo(10.638, 3)
    expect(r.limitingCheck).toBe('miso-setup')
    expect(r.roundTrip).toEqual({ min: 42 * ns, max: 42 * ns })
  })

  it('delayed MISO sampling doubles the round-trip limit', () => {
    // references.md 2.1 remedy: capture MISO later; sampling one half-cycle later gives the loop a whole period (timing-model.md 3)
    const r = analyzeSpi(spiLink({ controller: { delayedSampling: true } }), isoChains(16 * ns))
    // miso-setup now allows 2H >= 32 ns; the next limit is elsewhere or the cap
    expect(check(r, 'miso-setup').slope).toBe(2)
    expect(check(r, 'miso-hold').slope).toBe(0)
    expect(r.maxSclkHz!).toBeGreaterThanOrEqual(1 / (2 * 16 * ns) - 1)
  })

  it('reports the requiredSlack guard in the maximum', () => {
    // common practice: a guard of g shifts the half period needed by g
    const r = analyzeSpi(spiLink({ requiredSlack: 4 * ns }), isoChains(16 * ns))
    expect(r.maxSclkHz!).toBeCloseTo(1 / (2 * 36 * ns), 0)
  })
})

describe('analyzeSpi: edges, widths and skew', () => {
  // SCLK that rises slowly (20 ns) and falls fast (10 ns): which edge each check uses
  const sclkAsym = () => [
    chain('sclk', 'sclk', flat(20 * ns), flat(10 * ns)),
    chain('mosi', 'mosi', flat(10 * ns), flat(10 * ns)),
    chain('miso', 'miso', flat(10 * ns), flat(10 * ns)),
    chain('cs', 'cs', flat(10 * ns), flat(10 * ns)),
  ]
  const H = 500 * ns // 1 MHz

  it('mode 0 launches MISO on the falling (trailing) edge, mode 1 on the rising (leading) edge', () => {
    // timing-model.md 3: CPHA 0 changes data on the trailing edge, CPHA 1 on the leading edge; CPOL 0 leads with a rising edge
    const m0 = analyzeSpi(spiLink({ cpol: 0, cpha: 0 }), sclkAsym())
    const m1 = analyzeSpi(spiLink({ cpol: 0, cpha: 1 }), sclkAsym())
    const m2 = analyzeSpi(spiLink({ cpol: 1, cpha: 0 }), sclkAsym())
    expect(m0.roundTrip.max).toBeCloseTo(20 * ns, 15) // falling 10 + MISO 10
    expect(m1.roundTrip.max).toBeCloseTo(30 * ns, 15) // rising 20 + MISO 10
    expect(m2.roundTrip.max).toBeCloseTo(30 * ns, 15) // CPOL 1: trailing edge rises
    expect(m0.mode).toBe(0)
    expect(m1.mode).toBe(1)
    expect(m2.mode).toBe(2)
    // MOSI sampled on the rising edge (mode 0): setup = H + 20 - 10
    expect(check(m0, 'mosi-setup').slack).toBeCloseTo(H + 10 * ns, 15)
    // mode 1 samples on the falling edge: H + 10 - 10
    expect(check(m1, 'mosi-setup').slack).toBeCloseTo(H, 15)
    expect(check(m0, 'mosi-hold').slack).toBeCloseTo(H - 10 * ns, 15)
  })

  it("SCLK's PWD shortens the high time and lengthens the low time at the peripheral", () => {
    // timing-model.md 3: T/2 changed by SCLK's PWD (D_rise - D_fall = +10 ns)
    const link = spiLink({ peripheral: { clockToOut: { min: 0, max: 0 }, sclkHighMin: 100 * ns, sclkLowMin: 100 * ns } })
    const r = analyzeSpi(link, sclkAsym())
    expect(check(r, 'sclk-high').slack).toBeCloseTo(H - 10 * ns - 100 * ns, 15)
    expect(check(r, 'sclk-low').slack).toBeCloseTo(H + 10 * ns - 100 * ns, 15)
    expect(check(r, 'sclk-high').slackFraction).toBeCloseTo((H - 110 * ns) / H, 12)
  })

  it('a package channel-to-channel skew bounds MOSI against SCLK tighter than the corners', () => {
    // datasheet skew definition (references.md 8.3): channels of one part differ by at most the skew
    const wide = (): ChainResult[] => [
      chain('sclk', 'sclk', [10 * ns, 20 * ns, 30 * ns], [10 * ns, 20 * ns, 30 * ns]),
      // one part's own |tPLH - tPHL| is within 1 ns (a stated PWD max), though the corners are wide
      chain('mosi', 'mosi', [10 * ns, 20 * ns, 30 * ns], [10 * ns, 20 * ns, 30 * ns], { pwd: { min: -1 * ns, max: 1 * ns } }),
      chain('miso', 'miso', flat(20 * ns), flat(20 * ns)),
      chain('cs', 'cs', flat(20 * ns), flat(20 * ns)),
    ]
    const apart = analyzeSpi(spiLink({}), wide())
    expect(check(apart, 'mosi-setup').slack).toBeCloseTo(H - 20 * ns, 15)
    const together = analyzeSpi(spiLink({ packages: [{ channels: ['sclk', 'mosi'], channelSkew: 2 * ns }] }), wide())
    // skew 2 ns between same-direction edges, plus MOSI's own 1 ns PWD for an opposite-direction data edge
    expect(check(together, 'mosi-setup').slack).toBeCloseTo(H - 3 * ns, 15)
    expect(check(together, 'mosi-hold').slack).toBeCloseTo(H - 3 * ns, 15)
    // different parts with a stated part-to-part skew of 6 ns
    const parts = wide().map((c) => ({ ...c, partSkew: 6 * ns }))
    expect(check(analyzeSpi(spiLink({}), parts), 'mosi-setup').slack).toBeCloseTo(H - 7 * ns, 15)
    // a wide PWD makes the package bound no tighter than the corners
    const loose = wide().map((c) => (c.id === 'mosi' ? { ...c, pwd: { min: -20 * ns, max: 20 * ns } } : c))
    const l = analyzeSpi(spiLink({ packages: [{ channels: ['sclk', 'mosi'], channelSkew: 2 * ns }] }), loose)
    expect(check(l, 'mosi-setup').slack).toBeCloseTo(H - 20 * ns, 15)
  })

  it('chip-select lead and lag use the controller times and the CS channel delay', () => {
    // timing-model.md 3: CS lead/lag at the peripheral. CS delay 30 ns, SCLK 10 ns, controller gives 100 ns lead and lag
    const chains = [
      chain('sclk', 'sclk', flat(10 * ns), flat(10 * ns)),
      chain('mosi', 'mosi', flat(10 * ns), flat(10 * ns)),
      chain('miso', 'miso', flat(10 * ns), flat(10 * ns)),
      chain('cs', 'cs', flat(30 * ns), flat(30 * ns)),
    ]
    const link = spiLink({
      controller: { csLeadTime: 100 * ns, csLagTime: 100 * ns },
      peripheral: { clockToOut: { min: 0, max: 0 }, csLead: 50 * ns, csLag: 20 * ns },
    })
    const r = analyzeSpi(link, chains)
    expect(check(r, 'cs-lead').slack).toBeCloseTo(100 * ns - 20 * ns - 50 * ns, 15)
    expect(check(r, 'cs-lag').slack).toBeCloseTo(100 * ns + 20 * ns - 20 * ns, 15)
    expect(check(r, 'cs-lead').slope).toBe(0)
    // without controller times the default is half a period
    const d = analyzeSpi(spiLink({ peripheral: { clockToOut: { min: 0, max: 0 }, csLead: 50 * ns } }), chains)
    expect(check(d, 'cs-lead').slack).toBeCloseTo(H - 20 * ns - 50 * ns, 15)
    expect(check(d, 'cs-lead').slope).toBe(1)
  })

  it('a CS lead the peripheral cannot get at any SCLK means no SCLK passes', () => {
    // common practice: a fixed controller lead time shorter than the peripheral needs fails at every rate
    const link = spiLink({ controller: { csLeadTime: 10 * ns }, peripheral: { clockToOut: { min: 0, max: 0 }, csLead: 50 * ns } })
    const r = analyzeSpi(link, isoChains(10 * ns))
    expect(r.maxSclkHz).toBeNull()
    expect(r.limitingCheck).toBe('cs-lead')
    expect(r.warnings.some((w) => w.code === 'no-pass')).toBe(true)
    expect(r.pass).toBe(false)
  })

  it('peak jitter of the edges reduces the slacks', () => {
    // timing-model.md 2/3: worst case uses each edge's peak jitter
    const j = isoChains(10 * ns).map((c) => ({ ...c, jitterPeak: 1 * ns }))
    const r0 = analyzeSpi(spiLink({}), isoChains(10 * ns))
    const r1 = analyzeSpi(spiLink({}), j)
    for (const id of SPI_CHECK_IDS) expect(check(r1, id).slack).toBeLessThan(check(r0, id).slack)
    expect(check(r0, 'sclk-high').slack - check(r1, 'sclk-high').slack).toBeCloseTo(2 * ns, 15)
  })

  it('warns for an inverted SCLK, MOSI or MISO and not when the receiver inverts it back', () => {
    // timing-model.md 1: an inverted channel is a functional error unless the receiver inverts
    const chains = isoChains(10 * ns).map((c) => (c.id === 'miso' ? { ...c, polarity: 'inverted' as const } : c))
    const r = analyzeSpi(spiLink({}), chains)
    const w = r.warnings.filter((x) => x.code === 'inverted-polarity')
    expect(w.map((x) => x.channel)).toEqual(['miso'])
    const link = spiLink({})
    link.channels.find((c) => c.id === 'miso')!.receiver.invert = true
    expect(analyzeSpi(link, chains).warnings.some((x) => x.code === 'inverted-polarity')).toBe(false)
  })

  it('no cs channel: CS is taken as not isolated and said so', () => {
    const r = analyzeSpi(spiLink({}, false), isoChains(10 * ns))
    expect(r.assumptions.some((a) => a.includes('no cs channel'))).toBe(true)
    expect(check(r, 'cs-lead').slack).toBeCloseTo(H + 10 * ns, 15)
  })
})

describe('analyzeSpi: candidates and the maximum', () => {
  it('lists the prescaler steps of the controller clock with their worst slack', () => {
    // common practice: SCLK = controller clock / prescaler (2, 4, ... 256 by default)
    const link = spiLink({ sclkHz: 10 * MHz, controller: { clockHz: 80 * MHz } })
    const r = analyzeSpi(link, isoChains(16 * ns)) // fmax 15.625 MHz
    expect(r.candidates.map((c) => c.sclkHz / MHz)).toEqual([40, 20, 10, 5, 2.5, 1.25, 0.625, 0.3125])
    expect(r.candidates.map((c) => c.pass)).toEqual([false, false, true, true, true, true, true, true])
    expect(r.candidates[r.fastestPassing!]!.sclkHz).toBe(10 * MHz)
    // 40 MHz: H = 12.5 ns against a 32 ns round trip
    expect(r.candidates[0]!.worstSlack).toBeCloseTo(12.5 * ns - 32 * ns, 15)
    expect(r.candidates[0]!.worstCheck).toBe('miso-setup')
  })

  it('uses the given prescalers', () => {
    const r = analyzeSpi(spiLink({ controller: { clockHz: 60 * MHz, prescalers: [6, 3, 5] } }), isoChains(16 * ns))
    expect(r.candidates.map((c) => c.prescaler)).toEqual([3, 5, 6])
  })

  it('every check meets the guard at maxSclkHz and one fails just above it (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 1, max: 200, noNaN: true }), { minLength: 8, maxLength: 8 }),
        fc.double({ min: 0, max: 50, noNaN: true }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.boolean(),
        fc.constantFrom(0, 1),
        fc.constantFrom(0, 1),
        (d, cto, guard, delayed, cpol, cpha) => {
          const t = d.map((x) => x * ns)
          const chains = [
            chain('sclk', 'sclk', [t[0]!, t[0]!, t[0]! + t[1]!], [t[2]!, t[2]!, t[2]! + t[1]!]),
            chain('mosi', 'mosi', [t[3]!, t[3]!, t[3]! + t[4]!], [t[3]!, t[3]!, t[3]! + t[4]!]),
            chain('miso', 'miso', [t[5]!, t[5]!, t[5]! + t[6]!], [t[7]!, t[7]!, t[7]! + t[6]!]),
            chain('cs', 'cs', flat(t[0]!), flat(t[0]!)),
          ]
          const link = spiLink({
            cpol: cpol as 0 | 1,
            cpha: cpha as 0 | 1,
            requiredSlack: guard * ns,
            controller: { delayedSampling: delayed, misoHold: 0 },
            peripheral: { clockToOut: { min: cto * ns * 0.5, max: cto * ns }, mosiSetup: 2 * ns, mosiHold: 1 * ns },
          })
          const r = analyzeSpi(link, chains)
          if (r.maxSclkHz === null || r.limitingCheck === null) return
          const at = analyzeSpi({ ...link, spi: { ...link.spi!, sclkHz: r.maxSclkHz } }, chains)
          for (const c of at.checks) expect(c.slack).toBeGreaterThanOrEqual(c.required - 1e-18)
          const above = analyzeSpi({ ...link, spi: { ...link.spi!, sclkHz: r.maxSclkHz * 1.001 } }, chains)
          expect(above.pass).toBe(false)
          for (const c of above.checks) expect(Number.isFinite(c.slack)).toBe(true)
        },
      ),
      { numRuns: 300 },
    )
  })
})

describe('analyzeSpi through analyzeLink (real chains)', () => {
  const iso = (tpd: number) => ({
    kind: 'digital' as const,
    name: 'generic digital isolator channel',
    inverting: false,
    tplh: { min: tpd, typ: tpd, max: tpd },
    tphl: { min: tpd, typ: tpd, max: tpd },
  })
  const link = (tpd: number, spi: Record<string, unknown> = {}): LinkInput => ({
    schemaVersion: 1,
    name: 'isolated SPI',
    protocol: 'spi',
    channels: (['sclk', 'mosi', 'miso', 'cs'] as const).map((id) => ({ id, role: id, stages: [iso(tpd)], receiver })),
    spi: { sclkHz: 10 * MHz, cpol: 0, cpha: 0, controller: {}, peripheral: { clockToOut: { min: 0, max: 0 } }, ...spi } as NonNullable<LinkInput['spi']>,
  })

  it('16 ns isolators: 15.625 MHz (TI prints 15.6 MHz)', () => {
    // references.md 2.2, TI E2E FAQ: fmax = 1/(4 tpd)
    const r = analyzeLink(link(16 * ns)).spi!
    expect(r.maxSclkHz! / MHz).toBeCloseTo(15.625, 6)
    expect(Math.abs(r.maxSclkHz! / MHz - 15.6)).toBeLessThanOrEqual(0.05)
    expect(r.checks.map((c) => c.id)).toEqual([...SPI_CHECK_IDS])
    expect(r.pass).toBe(true) // 10 MHz < 15.625 MHz
  })

  it('full loop 16 + 10 + 16 + 5 ns: 10.638 MHz, and the inverted MISO is flagged', () => {
    // references.md 2.1/2.2: TI datasheet SBAS707B loop formula, [D] 10.638 MHz
    const input = link(16 * ns, { controller: { misoSetup: 5 * ns }, peripheral: { clockToOut: { min: 10 * ns, max: 10 * ns } } })
    const a = analyzeLink(input)
    expect(a.spi!.maxSclkHz! / MHz).toBeCloseTo(10.638, 3)
    expect(a.spi!.limitingCheck).toBe('miso-setup')
    const inv = structuredClone(input)
    inv.channels[2]!.stages[0] = { ...iso(16 * ns), inverting: true }
    const b = analyzeLink(inv)
    expect(b.spi!.warnings.some((w) => w.code === 'inverted-polarity' && w.channel === 'miso')).toBe(true)
  })
})
