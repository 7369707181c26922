import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { parseCapture } from '../../../../server/captures/parse'
import { CaptureFormatError } from '../../../../server/captures/errors'
import { chunked } from '../../../factories/captures'

const rows = (n: number, f: (i: number) => string) => Array.from({ length: n }, (_, i) => f(i)).join('\n') + '\n'
const square = (i: number) => (i % 20 < 10 ? 0 : 3.3)

async function refusal(text: string | Uint8Array, options = {}): Promise<CaptureFormatError> {
  try {
    await parseCapture(chunked(text), options)
  } catch (e) {
    if (e instanceof CaptureFormatError) return e
    throw e
  }
  throw new Error('the capture was accepted')
}

describe('reading captures', () => {
  it('a plain CSV with a names row: time column and two voltage columns', async () => {
    // common practice: "Time,CH1,CH2" then one sample per line
    const text = 'Time,CH1,CH2\n' + rows(100, (i) => `${i * 1e-6},${square(i)},${3.3 - square(i)}`)
    const p = await parseCapture(chunked(text))
    expect(p.format.delimiter).toBe(',')
    expect(p.format.firstDataLine).toBe(2)
    expect(p.format.time.name).toBe('Time')
    expect(p.format.channels.map((c) => c.name)).toEqual(['CH1', 'CH2'])
    expect(p.sampleCount).toBe(100)
    expect(p.time[99]).toBeCloseTo(99e-6, 12)
    expect(p.channels[0]![15]).toBeCloseTo(3.3, 6)
    expect(p.channels[1]![15]).toBeCloseTo(0, 6)
    expect(p.ranges).toEqual([{ min: 0, max: expect.closeTo(3.3, 6) }, { min: 0, max: expect.closeTo(3.3, 6) }])
  })

  it('metadata lines, a names row and a units row in microseconds and millivolts', async () => {
    // common practice: scope exports put instrument settings first, then names and units
    const header = ['Model,Bench scope 4000', 'Record Length,50', 'Sample Interval,1e-06', 'Trigger Level,1.65', '', 'Time,Input,Output', '(us),(V),(mV)']
    const text = header.join('\r\n') + '\r\n' + rows(50, (i) => `${i}.0,${square(i)},${square(i) * 1000}`).replaceAll('\n', '\r\n')
    const p = await parseCapture(chunked(text, [13]))
    expect(p.format.firstDataLine).toBe(8)
    expect(p.format.header).toHaveLength(6)
    expect(p.format.time).toEqual({ name: 'Time', unit: 'us', scale: 1e-6 })
    expect(p.format.channels.map((c) => [c.name, c.unit, c.scale])).toEqual([['Input', 'V', 1], ['Output', 'mV', 1e-3]])
    expect(p.time[49]).toBeCloseTo(49e-6, 12)
    expect(p.channels[1]![15]).toBeCloseTo(3.3, 4)
  })

  it('tab-separated with the unit in the column name and a trailing delimiter', async () => {
    // common practice: "Time [ns]" style names; some tools end every row with a delimiter
    const text = 'Time [ns]\tA\tB\t\n' + rows(40, (i) => `${i * 10}\t${square(i)}\t${square(i + 5)}\t`)
    const p = await parseCapture(chunked(text))
    expect(p.format.delimiter).toBe('\t')
    expect(p.format.time.scale).toBe(1e-9)
    expect(p.time[1]).toBeCloseTo(10e-9, 15)
    expect(p.channels).toHaveLength(2)
  })

  it('semicolon-separated with decimal commas and quoted names', async () => {
    // common practice: exports in locales that write 0,5 for one half
    const text = '"Time";"CH1"\n' + rows(30, (i) => `${(i * 0.5).toString().replace('.', ',')};${square(i).toString().replace('.', ',')}`)
    const p = await parseCapture(chunked(text))
    expect(p.format.delimiter).toBe(';')
    expect(p.format.decimalComma).toBe(true)
    expect(p.format.time.name).toBe('Time')
    expect(p.time[3]).toBeCloseTo(1.5, 12)
    expect(p.channels[0]![12]).toBeCloseTo(3.3, 6)
  })

  it('no header at all, a UTF-8 byte order mark, no final newline', async () => {
    // common practice
    const text = '\uFEFF' + rows(20, (i) => `${i * 1e-3},${square(i)}`).trimEnd()
    const p = await parseCapture(chunked(text))
    expect(p.sampleCount).toBe(20)
    expect(p.format.time.name).toBe('time')
    expect(p.format.channels[0]!.name).toBe('ch1')
  })

  it('the result does not depend on how the bytes are chunked', async () => {
    // common practice: chunk boundaries fall anywhere, also inside a line or a UTF-8 character
    const text = 'Zeit (µs);Kanal 1 (V)\n' + rows(60, (i) => `${i};${(square(i) + i / 100).toFixed(3).replace('.', ',')}`)
    const whole = await parseCapture(chunked(text))
    await fc.assert(
      fc.asyncProperty(fc.array(fc.integer({ min: 1, max: 97 }), { minLength: 1, maxLength: 8 }), async (sizes) => {
        const p = await parseCapture(chunked(text, sizes))
        expect(p.format).toEqual(whole.format)
        expect(Array.from(p.time)).toEqual(Array.from(whole.time))
        expect(Array.from(p.channels[0]!)).toEqual(Array.from(whole.channels[0]!))
      }),
      { numRuns: 40 },
    )
    expect(whole.format.time.scale).toBe(1e-6)
  })

  it('progress is reported in bytes', async () => {
    // common practice
    const text = rows(500, (i) => `${i},${square(i)}`)
    const seen: number[] = []
    await parseCapture(chunked(text, [1000]), { onProgress: (b) => seen.push(b) })
    expect(seen.at(-1)).toBe(new TextEncoder().encode(text).length)
    expect(seen.length).toBeGreaterThan(2)
    expect([...seen].sort((a, b) => a - b)).toEqual(seen)
  })
})

describe('malformed captures are refused, naming the line', () => {
  const good = (n: number) => rows(n, (i) => `${i * 1e-6},${square(i)},${square(i)}`)

  it('a row with a missing value', async () => {
    // common practice: the message names the line as the user's editor numbers it
    const lines = ('Time,CH1,CH2\n' + good(2000)).split('\n')
    lines[1042] = '0.001041,3.3' // line 1043
    const e = await refusal(lines.join('\n'))
    expect(e.line).toBe(1043)
    expect(e.message).toBe('line 1043: expected 3 numbers, found 2')
  })

  it('a non-numeric value', async () => {
    // common practice
    const lines = ('Time,CH1,CH2\n' + good(300)).split('\n')
    lines[250] = '0.000249,3.3,overload'
    const e = await refusal(lines.join('\n'))
    expect(e.message).toBe('line 251: column 3 ("CH2") is not a number: "overload"')
  })

  it('time that goes backwards or repeats', async () => {
    // common practice: samples must be in time order, strictly increasing
    const lines = ('Time,CH1\n' + rows(300, (i) => `${i * 1e-6},${square(i)}`)).split('\n')
    lines[100] = '0.00005,0'
    const e = await refusal(lines.join('\n'))
    expect(e.line).toBe(101)
    expect(e.message).toMatch(/^line 101: time 0.00005 s is not after the previous sample's 0.000098 s/)
    const same = ('Time,CH1\n' + rows(300, (i) => `${i * 1e-6},${square(i)}`)).split('\n')
    same[10] = same[9]!
    expect((await refusal(same.join('\n'))).line).toBe(11)
  })

  it('too few samples', async () => {
    // common practice: at least 16 samples by default
    const e = await refusal('Time,CH1\n' + rows(5, (i) => `${i},${square(i)}`))
    expect(e.line).toBeNull()
    expect(e.message).toBe('only 5 samples; at least 16 are needed')
  })

  it('too many samples for the limit', async () => {
    // common practice: the limit bounds memory
    const e = await refusal(rows(100, (i) => `${i},${square(i)}`), { maxSamples: 50 })
    expect(e.message).toBe('line 51: more than 50 samples; shorten the record or split the capture')
  })

  it('no rows of numbers, an empty file, a single column', async () => {
    // common practice
    expect((await refusal('hello,world\nthis is,not a capture\n')).message).toMatch(/^no rows of numbers found/)
    expect((await refusal('')).message).toBe('the file is empty')
    expect((await refusal(rows(100, (i) => `${i}`))).message).toMatch(/^no rows of numbers found/)
  })

  it('binary files by their magic bytes, whatever their name', async () => {
    // common practice: PDF "%PDF-", ZIP "PK\x03\x04", PNG "\x89PNG\r\n\x1a\n", gzip 1f 8b
    const pdf = new TextEncoder().encode('%PDF-1.7\n1 0 obj\n<< /Type /Catalog >>\nendobj\n')
    expect((await refusal(pdf)).message).toBe('this is a PDF document, not a CSV or TSV capture')
    expect((await refusal(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 20, 0, 0, 0]))).message).toMatch(/ZIP archive/)
    expect((await refusal(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]))).message).toMatch(/PNG image/)
    expect((await refusal(new Uint8Array([0x1f, 0x8b, 8, 0, 0, 0]))).message).toMatch(/gzip/)
    expect((await refusal(new Uint8Array([0xff, 0xfe, 0x54, 0x00]))).message).toMatch(/UTF-16/)
  })

  it('a NUL byte after a text start, in the head or much later', async () => {
    // common practice: a text header followed by binary data is still binary
    const head = new TextEncoder().encode('Time,CH1\n0,0\n1e-6,0\n\u0000\u0001\u0002')
    expect((await refusal(head)).message).toMatch(/NUL byte/)
    const late = good(5000) + '1,2,\u0000\n'
    const e = await refusal(late)
    expect(e.line).toBe(5001)
    expect(e.message).toBe('line 5001: binary content (NUL byte)')
  })

  it('an endless line', async () => {
    // common practice: bounded memory, no huge strings
    const e = await refusal('Time,CH1\n' + '1'.repeat(70_000) + '\n')
    expect(e.message).toBe('line 2: longer than 65536 characters')
  })
})
