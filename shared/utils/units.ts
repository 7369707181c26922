/**
 * Engineering notation: the one parser and formatter for quantities typed and shown in
 * the UI. Values are SI (seconds, ohms, farads, hertz, baud ...); text carries an SI
 * prefix and, optionally, the unit: `4.7k`, `4k7`, `25 us`, `1.5u`, `38.4 kBd`, `15 pF`.
 */

/** SI prefixes accepted on input, with their powers of ten. `u` and `µ` both mean micro. */
const PREFIX: Record<string, number> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  µ: -6,
  μ: -6,
  m: -3,
  k: 3,
  K: 3,
  M: 6,
  G: 9,
}

/** Prefixes used on output, by power of ten. */
const OUT_PREFIX: Record<number, string> = { [-15]: 'f', [-12]: 'p', [-9]: 'n', [-6]: 'µ', [-3]: 'm', 0: '', 3: 'k', 6: 'M', 9: 'G' }

/**
 * Spellings of a unit the parser strips after the number (case-insensitive where the
 * unit allows it). The first spelling is the one the formatter prints.
 */
const UNIT_ALIASES: Record<string, string[]> = {
  s: ['s', 'sec'],
  Ω: ['Ω', '\u2126', 'ohms', 'ohm', 'R'],
  F: ['F'],
  H: ['H'],
  Hz: ['Hz'],
  Bd: ['Bd', 'baud', 'bps', 'bit/s'],
  V: ['V'],
  A: ['A'],
  W: ['W'],
  m: ['m'],
  's/m': ['s/m'],
  ppm: ['ppm'],
  '%': ['%'],
  UI: ['UI'],
  '': [],
}

export type ParseResult = { ok: true; value: number } | { ok: false; message: string }

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?/i

/**
 * Parse engineering notation into an SI number.
 * @param text  what the user typed
 * @param unit  the field's unit (a key of the alias table), e.g. 's', 'Ω', 'Bd'; '' for a plain number
 * Accepts `4.7k`, `4k7` (prefix as decimal point), `25 us`, `25µs`, `1.5e-6`, `38.4 kBd`,
 * `10 %` for unit '%' (returned as 10, the caller decides its scale).
 */
export function parseEng(text: string, unit = ''): ParseResult {
  let s = text.trim().replace(/\s+/g, ' ').replace(',', '.')
  if (s === '') return { ok: false, message: 'enter a value' }

  // strip the unit (or one of its spellings) from the end
  const aliases = UNIT_ALIASES[unit] ?? [unit]
  for (const a of [...aliases].sort((x, y) => y.length - x.length)) {
    if (!a) continue
    const caseless = a.length > 1 && a !== 'Hz' && a !== 'Bd'
    const tail = s.slice(-a.length)
    if (tail === a || (caseless && tail.toLowerCase() === a.toLowerCase())) {
      const rest = s.slice(0, -a.length).trimEnd()
      // "1 m" in seconds is milli, not the unit: only strip when something numeric is left
      if (rest !== '' && /[\d.]$|[fpnuµμmkKMG]$/.test(rest)) {
        s = rest
        break
      }
    }
  }

  // 4k7 style: the prefix stands for the decimal point (4R7 for ohms)
  const rkm = /^([+-]?\d+)([fpnuµμmkKMGR])(\d+)$/.exec(s)
  if (rkm && rkm[2] === 'R' && unit === 'Ω') return finite(Number(`${rkm[1]}.${rkm[3]}`))
  if (rkm && rkm[2] !== 'R') {
    const value = Number(`${rkm[1]}.${rkm[3]}`) * 10 ** PREFIX[rkm[2]!]!
    return finite(value)
  }

  const m = NUMBER.exec(s)
  if (!m) return { ok: false, message: `'${text.trim()}' is not a number` }
  let value = Number(m[0])
  const rest = s.slice(m[0].length).trim()
  if (rest !== '') {
    const p = PREFIX[rest]
    if (p === undefined) {
      const expect = unit ? ` (use a prefix f p n u m k M G${unit ? ` and ${unit}` : ''})` : ''
      return { ok: false, message: `unknown unit '${rest}'${expect}` }
    }
    value *= 10 ** p
  }
  return finite(value)
}

function finite(value: number): ParseResult {
  if (!Number.isFinite(value)) return { ok: false, message: 'the value is out of range' }
  // undo binary noise from the prefix multiplication (4.7 * 1e3 = 4700.000000000001)
  return { ok: true, value: Number(value.toPrecision(12)) }
}

/** Units printed as plain numbers, never with an SI prefix (0.1 UI, not 100 mUI). */
const PLAIN_UNITS = new Set(['', 'UI', '%', 'ppm'])

export interface FormatOptions {
  /** significant digits, default 3 */
  digits?: number
  /** keep trailing zeros (4.70 k), default false */
  fixed?: boolean
  /** separator between number and prefix+unit, default a space */
  space?: string
}

/**
 * Format an SI value in engineering notation: `4.7 kΩ`, `25 µs`, `38.4 kBd`, `-1.2 ns`.
 * Non-finite or null values print as an en dash. Powers beyond the prefix table fall back
 * to exponent notation.
 */
export function formatEng(value: number | null | undefined, unit = '', opts: FormatOptions = {}): string {
  const { digits = 3, fixed = false, space = ' ' } = opts
  if (value === null || value === undefined || !Number.isFinite(value)) return '–'
  const u = unit === '' ? '' : (UNIT_ALIASES[unit]?.[0] ?? unit)
  if (value === 0) return u ? `0${space}${u}` : '0'
  if (PLAIN_UNITS.has(unit)) {
    // ratios and counts read better without prefixes: 0.85, 1e-12, 10000 ppm, 20 %
    const t = String(Number(value.toPrecision(digits)))
    return u ? `${t}${space}${u}` : t
  }
  const abs = Math.abs(value)
  let exp = Math.floor(Math.log10(abs) / 3) * 3
  let mant = value / 10 ** exp
  // rounding may carry to 1000 (999.96 -> 1000): move to the next prefix
  if (Math.abs(Number(mant.toPrecision(digits))) >= 1000) {
    exp += 3
    mant = value / 10 ** exp
  }
  const prefix = OUT_PREFIX[exp]
  if (prefix === undefined) return `${value.toExponential(digits - 1)}${u ? space + u : ''}`
  let text = mant.toPrecision(digits)
  if (!fixed && text.includes('.')) text = text.replace(/\.?0+$/, '')
  if (text.includes('e')) text = String(Number(text))
  const suffix = prefix + u
  return suffix ? `${text}${space}${suffix}` : text
}

/** Format a value as it should be shown back in an input field (no trailing zeros, 4 digits). */
export function formatInput(value: number | null | undefined, unit = ''): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return ''
  return formatEng(value, unit, { digits: 4 })
}

/** A fraction as a percentage, `0.125` -> `12.5 %`. */
export function formatPercent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '–'
  return `${Number((fraction * 100).toPrecision(digits))} %`
}

/** A margin in unit intervals with its sign, `+0.132 UI`, `-0.041 UI`. */
export function formatUi(ui: number | null | undefined, decimals = 3): string {
  if (ui === null || ui === undefined || !Number.isFinite(ui)) return '–'
  const t = ui.toFixed(decimals)
  return `${ui > 0 ? '+' : ''}${t === `-${(0).toFixed(decimals)}` ? (0).toFixed(decimals) : t} UI`
}
