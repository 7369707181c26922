import { describe, expect, it } from 'vitest'
import { compareValues } from '../../../../app/utils/csv'
import { csvCell, toCsv } from '../../../../shared/utils/csv'
import { diffSpecs } from '../../../../shared/utils/specDiff'

describe('CSV export', () => {
  it('quotes what needs quoting and writes CRLF lines', () => {
    expect(csvCell('a,b')).toBe('"a,b"')
    expect(csvCell('say "hi"')).toBe('"say ""hi"""')
    expect(csvCell(null)).toBe('')
    expect(csvCell(Number.NaN)).toBe('')
    expect(toCsv(['baud', 'margin (UI)'], [[38400, -0.485]])).toBe('baud,margin (UI)\r\n38400,-0.485\r\n')
  })
  it('neutralises text a spreadsheet would run as a formula; numbers stay numbers (OWASP, CSV injection)', () => {
    for (const f of ['=HYPERLINK("http://x","y")', '@SUM(1+1)', '+1', '-1+2', '\tx', '\rx']) expect(csvCell(f).replace(/^"|"$/g, '').startsWith("'")).toBe(true)
    expect(toCsv(['stage'], [['=cmd|calc'], ['PTC-20']])).toBe('stage\r\n"\'=cmd|calc"\r\nPTC-20\r\n')
    expect(csvCell(-0.5)).toBe('-0.5')
  })
  it('sorts numbers numerically with missing values last', () => {
    expect([3, null, 10, 2].sort(compareValues)).toEqual([2, 3, 10, null])
    expect(['d10', 'd2'].sort(compareValues)).toEqual(['d2', 'd10'])
  })
})

describe('diffSpecs', () => {
  it('lists every leaf that differs, with both values', () => {
    const d = diffSpecs({ a: 1, b: { c: [1, 2] } }, { a: 1, b: { c: [1, 3] }, e: 'x' })
    expect(d).toEqual([
      { path: 'b.c.1', mine: 2, theirs: 3 },
      { path: 'e', mine: undefined, theirs: 'x' },
    ])
  })
})
