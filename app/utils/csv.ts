/** Browser side of the table exports (the CSV writer itself is shared/utils/csv.ts). */
/** Offer a CSV string as a file download (browser only). */
export function downloadCsv(filename: string, csv: string) {
  const blob = new Blob([csv], { type: 'text/csv;charset=utf-8' })
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = filename.endsWith('.csv') ? filename : `${filename}.csv`
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 1000)
}

/** Sort helper: nulls last, numbers numerically, text by locale. */
export function compareValues(a: unknown, b: unknown): number {
  const na = a === null || a === undefined || (typeof a === 'number' && !Number.isFinite(a))
  const nb = b === null || b === undefined || (typeof b === 'number' && !Number.isFinite(b))
  if (na || nb) return na === nb ? 0 : na ? 1 : -1
  if (typeof a === 'number' && typeof b === 'number') return a - b
  if (typeof a === 'boolean' && typeof b === 'boolean') return Number(a) - Number(b)
  return String(a).localeCompare(String(b), undefined, { numeric: true })
}
