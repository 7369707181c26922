/**
 * CSV writing for every table export, in the browser and on the server (RFC 4180: comma
 * separated, CRLF line ends, quotes doubled). Numbers are written in plain SI so a
 * spreadsheet can recompute with them; the header names the unit.
 */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined) return ''
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : String(v)
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n'
}
