/**
 * The link schema's refinements and their messages (issue 12): every rule names the field
 * it is about and says what is wrong in words an engineer reads; a good link parses with its
 * defaults filled in. These messages are what a 400 says and what the form shows.
 */
import { describe, expect, it } from 'vitest'
import { ADC_SPI_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { DelaySpec, LinkSpec, ReceiverSpec, SchmittThresholds, TransitionSpec, UartRxSpec } from '../../../../shared/schemas/link'

type Json = Record<string, unknown>
const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T

/** The first issue of a failed parse, as "path: message". */
function issue(schema: { safeParse: (v: unknown) => { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } } }, value: unknown): string {
  const r = schema.safeParse(value)
  expect(r.success, 'expected the value to be refused').toBe(false)
  const i = r.error!.issues[0]!
  return `${i.path.map(String).join('.')}: ${i.message}`
}

describe('link schema: good links', () => {
  it('parses the demo links and fills in the schema version and defaults', () => {
    const uart = LinkSpec.parse(TELEMETRY_LINK)
    expect(uart.schemaVersion).toBe(2)
    expect(uart.uart!.rx.sampler).toBeDefined()
    expect(LinkSpec.parse(ADC_SPI_LINK).protocol).toBe('spi')
  })
})

describe('link schema: corners and ranges', () => {
  it('delay corners in order', () => {
    expect(DelaySpec.safeParse({ min: 1e-9, typ: 2e-9, max: 3e-9 }).success).toBe(true)
    expect(issue(DelaySpec, { min: 3e-9, typ: 2e-9, max: 4e-9 })).toMatch(/min <= typ <= max/)
  })
  it('a transition time with typ above max is refused', () => {
    expect(issue(TransitionSpec, { typ: 5e-9, max: 4e-9 })).toMatch(/typ <= max/)
  })
  it('Schmitt thresholds in the wrong order are refused, naming the rule (issue 18)', () => {
    // common practice: a Schmitt input switches up at VT+ and down at VT-, VT+ above VT-
    expect(issue(SchmittThresholds, { vtPlus: 1.0, vtMinus: 3.0 })).toMatch(/VT\+ must not lie below VT-/)
    expect(SchmittThresholds.safeParse({ vtPlus: 2.0, vtMinus: 1.0 }).success).toBe(true)
  })
})

describe('link schema: receiver', () => {
  const rx = { vdd: 3.3, vil: 0.99, vih: 2.31 }
  it('VIL must be below VIH, reported on vil', () => {
    expect(issue(ReceiverSpec, { ...rx, vil: 2.5 })).toBe('vil: vil must be below vih')
  })
  it('a Schmitt receiver needs both thresholds, in order', () => {
    expect(issue(ReceiverSpec, { ...rx, schmitt: true })).toMatch(/a Schmitt input needs vtPlus and vtMinus/)
    expect(issue(ReceiverSpec, { ...rx, schmitt: true, vtPlus: 1, vtMinus: 2 })).toMatch(/vtPlus must not lie below vtMinus/)
  })
})

describe('link schema: UART receiver sampling', () => {
  const base = { errorPpm: 1000, sampler: 'ticks', oversampling: 16 }
  it('sample ticks inside the bit, increasing, and as many as the vote needs', () => {
    expect(issue(UartRxSpec, { ...base, vote: 'majority', sampleTicks: [7, 8, 16] })).toBe('sampleTicks: every sample tick must be below oversampling')
    expect(issue(UartRxSpec, { ...base, vote: 'majority', sampleTicks: [9, 8, 7] })).toBe('sampleTicks: sample ticks must be strictly increasing')
    expect(issue(UartRxSpec, { ...base, vote: 'single', sampleTicks: [7, 8] })).toBe("sampleTicks: vote 'single' takes exactly one tick")
    expect(issue(UartRxSpec, { ...base, vote: 'majority', sampleTicks: [7, 8] })).toBe("sampleTicks: vote 'majority' takes an odd number of at least three ticks")
  })
  it('a clock is given as an error or as a generator', () => {
    const { errorPpm: _, ...noClock } = base
    expect(issue(UartRxSpec, { ...noClock, vote: 'majority' })).toBe('errorPpm: give errorPpm or a baud generator clockHz')
  })
})

describe('link schema: phototransistor stage', () => {
  const stageOf = (l: Json) => ((l.channels as Json[])[0]!.stages as Json[])[0]!
  it('needs an LED resistor or current, and a typical CTR not below the minimum', () => {
    const l = clone(TELEMETRY_LINK) as unknown as Json
    const st = stageOf(l)
    delete st.rLed
    delete st.ledCurrent
    expect(issue(LinkSpec, l)).toBe("channels.0.stages.0.rLed: give rLed or ledCurrent")
    const l2 = clone(TELEMETRY_LINK) as unknown as Json
    stageOf(l2).ctrTyp = 0.1
    expect(issue(LinkSpec, l2)).toBe('channels.0.stages.0.ctrTyp: typical CTR must be at least ctrMin')
  })
  it('two characterisation points at the same conditions are refused: they would explode the fit (issue 18)', () => {
    const l = clone(TELEMETRY_LINK) as unknown as Json
    const st = stageOf(l)
    const p = (st.characterization as Json[])[0]!
    st.characterization = [p, { ...p, rl: (p.rl as number) * 1.000001, tplh: (p.tplh as number) * 1.1 }]
    expect(issue(LinkSpec, l)).toMatch(/were taken at the same conditions .* merge them into one point/)
  })
  it('a point needs at least one time', () => {
    const l = clone(TELEMETRY_LINK) as unknown as Json
    ;(stageOf(l).characterization as Json[])[0] = { rl: 4700 }
    expect(issue(LinkSpec, l)).toMatch(/a characterisation point needs at least one of tplh, tphl, tr, tf/)
  })
})

describe('link schema: the link as a whole', () => {
  it('channel ids are unique, named at the duplicate', () => {
    const l = clone(ADC_SPI_LINK) as unknown as Json
    const chs = l.channels as Json[]
    chs[1]!.id = chs[0]!.id
    expect(issue(LinkSpec, l)).toBe(`channels.1.id: duplicate channel id '${chs[0]!.id}'`)
  })
  it('a UART link needs its settings and uart channels; an SPI link its roles', () => {
    const u = clone(TELEMETRY_LINK) as unknown as Json
    delete u.uart
    expect(issue(LinkSpec, u)).toBe('uart: a UART link needs uart settings')
    const s = clone(ADC_SPI_LINK) as unknown as Json
    s.channels = (s.channels as Json[]).filter((c) => c.role !== 'miso')
    expect(issue(LinkSpec, s)).toBe("channels: an SPI link needs exactly one 'miso' channel")
  })
})
