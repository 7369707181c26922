/**
 * RS-485 half-duplex turnaround through isolators (timing-model.md section 4): the enable line
 * as a channel of its own, checked at the bus. Each expectation is the rule worked by hand.
 */
import { describe, expect, it } from 'vitest'
import { rs485Turnaround } from '../../../../server/timing/rs485'

// an isolated transmitter at 115200 Bd, 8N1: isolator 20..35 ns on both channels, driver 10..30 ns, enable 60 ns, disable at least 20 ns
const base = {
  baud: 115200,
  frameBits: 10,
  leadTime: 1e-6,
  lagTime: 0,
  dataPath: { min: 30e-9, max: 65e-9 },
  enablePath: { min: 20e-9, max: 35e-9 },
  driverEnable: 60e-9,
  driverDisable: 20e-9,
}

describe('RS-485 turnaround', () => {
  it('gives the lead and lag slack at the bus', () => {
    const r = rs485Turnaround(base)
    // lead: the start edge reaches the bus at 30 ns; the driver is on at -1 us + 35 ns + 60 ns
    expect(r.leadSlack).toBeCloseTo(30e-9 - (-1e-6 + 35e-9 + 60e-9), 15)
    // lag: DE released at the frame's end, off at the bus 20 + 20 ns later; the stop bit ends there 65 ns after it ends at TX
    expect(r.lagSlack).toBeCloseTo(20e-9 + 20e-9 - 65e-9, 15)
    expect(r.pass).toBe(false)
  })

  it('passes once the firmware holds DE a little past the stop bit, and fails an enable asserted with the start bit', () => {
    expect(rs485Turnaround({ ...base, lagTime: 1e-6 }).pass).toBe(true)
    const late = rs485Turnaround({ ...base, leadTime: 0, lagTime: 1e-6 })
    expect(late.leadSlack).toBeCloseTo(30e-9 - 95e-9, 15)
    expect(late.pass).toBe(false)
    // releasing DE on a "transmit register empty" event one bit early cuts the stop bit by about a bit
    expect(rs485Turnaround({ ...base, lagTime: -1 / 115200 }).lagSlack).toBeLessThan(-8e-6)
  })

  it('refuses inputs that cannot be right', () => {
    expect(() => rs485Turnaround({ ...base, dataPath: { min: 80e-9, max: 65e-9 } })).toThrow(/data path/)
    expect(() => rs485Turnaround({ ...base, baud: 0 })).toThrow(/baud/)
  })
})
