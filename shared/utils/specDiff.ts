/**
 * Compare two link specs field by field (the "someone else saved" dialog, bitslack diff): every
 * leaf path whose value differs, with both values. Pure, no Vue.
 */
export interface SpecDifference {
  path: string
  mine: unknown
  theirs: unknown
}

export function flattenSpec(value: unknown, prefix = '', out: Record<string, unknown> = {}): Record<string, unknown> {
  if (value !== null && typeof value === 'object') {
    const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value as Record<string, unknown>)
    if (!entries.length) out[prefix] = Array.isArray(value) ? '[]' : '{}'
    for (const [k, v] of entries) flattenSpec(v, prefix ? `${prefix}.${k}` : k, out)
  } else if (value !== undefined) out[prefix] = value
  return out
}

export function diffSpecs(mine: unknown, theirs: unknown): SpecDifference[] {
  const a = flattenSpec(mine)
  const b = flattenSpec(theirs)
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort((x, y) => x.localeCompare(y, undefined, { numeric: true }))
  return keys.filter((k) => a[k] !== b[k]).map((k) => ({ path: k, mine: a[k], theirs: b[k] }))
}
