/** A CSV text as rows of strings (papaparse, RFC 4180 quoting), the header first. */
import Papa from 'papaparse'

export function parseCsv(text: string): string[][] {
  const r = Papa.parse<string[]>(text, { skipEmptyLines: true })
  if (r.errors.length) throw new Error(`CSV: ${r.errors[0]!.message} (row ${r.errors[0]!.row})`)
  return r.data
}
