/** Revision comparison of bus links (issue 15): the bus checks' slack and what the link allows at most are compared too. */
import { describe, expect, it } from 'vitest'
import { FIELD_RS485_LINK, MONITOR_I2C_LINK, PUMP_CAN_LINK } from '../../../../server/db/seeders/demo-links'
import { analyzeParsedLink } from '../../../../server/timing'
import { diffLinks, groupInputs } from '../../../../shared/report/compare'
import { LinkSpec, type LinkInput } from '../../../../shared/schemas/link'

const pair = (base: LinkInput, edit: (l: LinkInput) => void) => {
  const a = LinkSpec.parse(base)
  const bIn = structuredClone(base)
  edit(bIn)
  const b = LinkSpec.parse(bIn)
  return diffLinks(a, b, analyzeParsedLink(a), analyzeParsedLink(b))
}

describe('comparing bus links', () => {
  it('I2C: a stronger target pull-up raises the highest SCL and the target-side checks, under "I2C settings"', () => {
    const d = pair(MONITOR_I2C_LINK, (l) => (l.i2c!.target.rp = 1500))
    const scl = d.margins.find((m) => m.what === 'highest SCL')!
    expect(scl.change).toBeGreaterThan(0)
    expect(d.margins.find((m) => m.what === 'check rise-target')!.change).toBeGreaterThan(0)
    const groups = groupInputs(d.inputs, LinkSpec.parse(MONITOR_I2C_LINK), LinkSpec.parse(MONITOR_I2C_LINK))
    expect(groups.map((g) => g.title)).toEqual(['I2C settings'])
  })

  it('CAN: a longer bus costs loop-delay slack and leaves the longest bus as it was', () => {
    // the firmware's own setting (16 tq of 125 ns from 40 MHz), so the same Prop_Seg is compared
    const fixed = { ...structuredClone(PUMP_CAN_LINK), can: { ...PUMP_CAN_LINK.can!, timing: { brp: 5, propSeg: 7, phaseSeg1: 6, phaseSeg2: 2, sjw: 2 } } }
    const d = pair(fixed, (l) => (l.can!.busLength = 35))
    // 10 m more at 5 ns/m, both ways: 100 ns less slack
    expect(d.margins.find((m) => m.what === 'check loop-delay')!.change).toBeCloseTo(-100e-9, 15)
    expect(d.margins.find((m) => m.what === 'longest bus')).toBeUndefined()
  })

  it('RS-485: the DE lead that fixes the demo shows as the biggest gain of turnaround slack', () => {
    const d = pair(FIELD_RS485_LINK, (l) => (l.rs485!.leadTime = 5e-6))
    expect(d.verdict).toEqual({ a: 'fail', b: 'pass' })
    expect(d.margins.find((m) => m.what === 'check de-lead')!.change).toBeCloseTo(5e-6, 15)
  })
})
