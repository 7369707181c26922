/**
 * CSV writing for every table export, in the browser and on the server (RFC 4180: comma
 * separated, CRLF line ends, quotes doubled), through papaparse. Numbers are written in
 * plain SI so a spreadsheet can recompute with them; the header names the unit. A text
 * cell that a spreadsheet would run as a formula (it starts with =, +, -, @, a tab or a
 * carriage return) is neutralised with a leading apostrophe (papaparse's escapeFormulae).
 */
import Papa from 'papaparse'

/** A value as a CSV field: null, undefined and non-finite numbers are empty. */
function field(v: unknown): string | number | boolean {
  if (v === null || v === undefined) return ''
  if (typeof v === 'number') return Number.isFinite(v) ? v : ''
  if (typeof v === 'boolean') return v
  return String(v)
}

/** One value as a CSV cell (quoted when it must be, a formula neutralised). */
export function csvCell(v: unknown): string {
  return Papa.unparse([[field(v)]], { escapeFormulae: true })
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return Papa.unparse({ fields: header, data: rows.map((r) => r.map(field)) }, { newline: '\r\n', escapeFormulae: true }) + '\r\n'
}
