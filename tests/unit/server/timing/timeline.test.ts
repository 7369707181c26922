import { describe, expect, it } from 'vitest'
import { TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { analyzeLink, parseLink } from '../../../../server/timing'
import { frameCells } from '../../../../server/timing/timeline'

const levels = (mask: number, n: number) => Array.from({ length: n }, (_, j) => Math.floor(mask / 2 ** j) % 2)

describe('frameCells: the frame of every data value (the engine owns the frame and parity rule)', () => {
  it('puts start, data LSB first, parity and stop bits in order', () => {
    // common practice: UART frame = start 0, data LSB first, optional parity, stop 1
    const f8n1 = frameCells({ dataBits: 8, parity: 'none', stopBits: 1, backToBack: false, frameBits: 10 })
    expect(levels(f8n1.levels[0x01]!, f8n1.cells.length)).toEqual([0, 1, 0, 0, 0, 0, 0, 0, 0, 1])
    const f8e2 = frameCells({ dataBits: 8, parity: 'even', stopBits: 2, backToBack: false, frameBits: 12 })
    expect(levels(f8e2.levels[0x03]!, f8e2.cells.length)).toEqual([0, 1, 1, 0, 0, 0, 0, 0, 0, 0, 1, 1])
    const f7o1 = frameCells({ dataBits: 7, parity: 'odd', stopBits: 1, backToBack: false, frameBits: 10 })
    expect(levels(f7o1.levels[0x01]!, f7o1.cells.length)).toEqual([0, 1, 0, 0, 0, 0, 0, 0, 0, 1])
    const f5m15 = frameCells({ dataBits: 5, parity: 'mark', stopBits: 1.5, backToBack: false, frameBits: 8.5 })
    expect(levels(f5m15.levels[0]!, f5m15.cells.length)).toEqual([0, 0, 0, 0, 0, 0, 1, 1, 1])
    expect(frameCells({ dataBits: 8, parity: 'even', stopBits: 1, backToBack: false, frameBits: 11 }).cells).toEqual(['start', 'd0', 'd1', 'd2', 'd3', 'd4', 'd5', 'd6', 'd7', 'parity', 'stop'])
    expect(f8n1.levels).toHaveLength(256)
  })
})

describe('the timeline in the analysis', () => {
  const a = analyzeLink(parseLink(TELEMETRY_LINK))
  const u = a.uart!
  const ch = a.channels.find((c) => c.id === u.channelId)!
  const t = u.timeline!

  it('follows the frame through every stage: sent, each stage but the last, the pin with its corners, the UART view', () => {
    expect(t.lanes.map((l) => l.kind)).toEqual(['sent', ...ch.stages.slice(0, -1).map(() => 'stage'), 'received', 'uart'])
    const pin = t.lanes.find((l) => l.kind === 'received')!
    expect(pin.edges.rise).toBe(ch.rise.typ)
    expect(pin.edges.riseRange).toEqual({ min: ch.rise.min, max: ch.rise.max })
    expect(pin.inverted).toBe(ch.polarity === 'inverted')
  })

  it("syncs on the start edge's arrival as the UART sees it, after the receiver's own inversion", () => {
    const inverts = a.input.channels.find((c) => c.id === u.channelId)!.receiver.invert ?? false
    expect(t.sync).toBe(inverts ? ch.rise.typ : ch.fall.typ)
    const uart = t.lanes.at(-1)!
    // the UART sees the logical frame: idle high, so its lane is not inverted when the receiver undoes the pin's inversion
    expect(uart.inverted).toBe((ch.polarity === 'inverted') !== inverts)
  })

  it('gives every direction of a two-way link its own timeline', () => {
    for (const d of u.byChannel) expect(d.timeline?.cells[0]).toBe('start')
  })
})
