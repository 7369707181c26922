import { CaptureFormatError } from './errors'
import { MinMaxDownsampler, type CaptureWaveform } from './downsample'
import { sniffText } from './sniff'
import type { Delimiter, CaptureColumn, CaptureFormat } from '../../shared/types/capture'
export type { Delimiter, CaptureColumn, CaptureFormat }

/*
 * Streaming CSV/TSV reader for oscilloscope exports.
 *
 * Why our own line splitter and not papaparse: the format is plain numbers (no quoted
 * fields with embedded delimiters or newlines in the data section), we must name the
 * exact file line of every problem (papaparse's row index skips blank lines and does
 * not count header lines the way the user sees them), and splitting decoded chunks
 * ourselves avoids papaparse's per-row result objects. Speed is about the same: warm,
 * ~0.55 s per 1M rows x 3 columns for both (bench/captures.bench.ts prints both).
 * Quotes around fields are stripped.
 *
 * Memory: the decoded text is never held whole, only one chunk (~64 KiB) plus one
 * partial line. Samples go into compact typed arrays (time Float64, voltages Float32)
 * rather than a temp file read twice: the IEEE 181 state levels need a histogram of
 * every sample before any transition can be judged, and the 10 % instant of an edge is
 * found by looking back from the point where the edge is detected, both trivial on
 * arrays. 1M samples x 2 channels = 8 MB + 2 x 4 MB; maxSamples bounds the worst case
 * (2M x 8 channels = 80 MB). Float32 keeps 24 bits of mantissa, far more than a scope's
 * 8-16 bit ADC resolves; time stays Float64 (a 1M-sample record needs more than
 * 24 bits of relative resolution). A two-pass temp-file design would halve the resident
 * memory but double the I/O and need disk space and clean-up in the job; not worth it
 * at these sizes.
 */




export interface ParsedCapture {
  format: CaptureFormat
  sampleCount: number
  /** seconds, strictly increasing, length sampleCount */
  time: Float64Array
  /** volts, one array per voltage column, each length sampleCount */
  channels: Float32Array[]
  /** per channel: lowest and highest value seen (volts) */
  ranges: { min: number; max: number }[]
  /** min/max decimation for display, computed in the same pass */
  waveform: CaptureWaveform
  /** bytes read from the source */
  bytes: number
}

export interface ParseOptions {
  /** refuse files with more samples than this (default 2,000,000) */
  maxSamples?: number
  /** fewest samples accepted (default 16) */
  minSamples?: number
  /** most voltage columns accepted (default 8) */
  maxChannels?: number
  /** longest line accepted, in characters (default 65,536) */
  maxLineLength?: number
  /** most header lines before the first sample (default 200) */
  maxHeaderLines?: number
  /** buckets of the display waveform (even; default 1000, i.e. up to 2000 points per channel) */
  displayBuckets?: number
  /** called after every chunk with the bytes read so far */
  onProgress?: (bytesRead: number) => void
}

const TIME_UNITS: Record<string, number> = { s: 1, sec: 1, secs: 1, second: 1, seconds: 1, ms: 1e-3, us: 1e-6, 'µs': 1e-6, 'μs': 1e-6, ns: 1e-9, ps: 1e-12 }
const VOLT_UNITS: Record<string, number> = { v: 1, volt: 1, volts: 1, mv: 1e-3, uv: 1e-6, 'µv': 1e-6, 'μv': 1e-6, kv: 1e3, a: 1, ma: 1e-3, ua: 1e-6, 'µa': 1e-6 }
const UNIT_ROW = /^[([]?\s*(s|sec|secs|second|seconds|ms|us|µs|μs|ns|ps|v|volt|volts|mv|uv|µv|μv|kv|a|ma|ua|µa)?\s*[)\]]?$/i

/** Strip one pair of surrounding double quotes and whitespace. */
function clean(field: string): string {
  let s = field.trim()
  if (s.length >= 2 && s.charCodeAt(0) === 34 && s.charCodeAt(s.length - 1) === 34) s = s.slice(1, -1).trim()
  return s
}

/** Split a line into fields, dropping one empty field left by a trailing delimiter. */
function fieldsOf(line: string, d: Delimiter): string[] {
  const f = line.split(d)
  if (f.length > 1 && f[f.length - 1]!.trim() === '') f.pop()
  return f
}

function toNumber(s: string, decimalComma: boolean): number {
  let x = s
  if (x.charCodeAt(0) === 34 || x.charCodeAt(x.length - 1) === 34) x = clean(x)
  if (decimalComma) x = x.replace(',', '.')
  const v = Number(x)
  if (v === 0 && x.trim() === '') return NaN
  return v
}

/** Field count when every field of `line` is a finite number, else 0. */
function numericFieldCount(line: string, d: Delimiter, decimalComma: boolean): number {
  const f = fieldsOf(line, d)
  if (f.length < 2) return 0
  for (const s of f) if (!Number.isFinite(toNumber(s, decimalComma))) return 0
  return f.length
}

interface Layout {
  delimiter: Delimiter
  decimalComma: boolean
  /** index into the head lines of the first sample */
  dataIndex: number
  columnCount: number
}

const CANDIDATES: readonly [Delimiter, boolean][] = [['\t', false], ['\t', true], [';', false], [';', true], [',', false]]

/**
 * Pick the delimiter (and decimal separator) under which the most head lines read as
 * rows of numbers with the same field count as the first such row; ties go to tab,
 * then semicolon, then comma.
 */
function detectLayout(lines: readonly string[]): Layout | null {
  let best: (Layout & { score: number }) | null = null
  for (const [d, dc] of CANDIDATES) {
    let first = -1
    let count = 0
    let score = 0
    for (let i = 0; i < lines.length; i++) {
      if (lines[i]!.trim() === '') continue
      const n = numericFieldCount(lines[i]!, d, dc)
      if (first < 0) {
        if (n >= 2) {
          first = i
          count = n
          score = 1
        }
      } else if (n === count) score++
    }
    if (first >= 0 && (!best || score > best.score)) best = { delimiter: d, decimalComma: dc, dataIndex: first, columnCount: count, score }
  }
  return best
}

/** The unit in a column name such as "Time (us)", "CH1 [mV]" or "Time/s", or null. */
function unitInName(name: string): string | null {
  const m = /[([]\s*([^)\]]+?)\s*[)\]]\s*$/.exec(name) ?? /\/\s*([A-Za-zµμ]+)\s*$/.exec(name)
  return m ? m[1]! : null
}

function describeColumns(headLines: readonly string[], layout: Layout, warnings: string[]): { time: CaptureColumn; channels: CaptureColumn[]; timeIndex: number } {
  const rows = headLines.slice(0, layout.dataIndex).filter((l) => l.trim() !== '').map((l) => fieldsOf(l, layout.delimiter).map(clean))
  const matching = rows.filter((r) => r.length === layout.columnCount)
  const isUnits = (r: string[]) => r.every((f) => UNIT_ROW.test(f)) && r.some((f) => f !== '')
  let names: string[] | null = null
  let units: string[] | null = null
  for (const r of matching) {
    if (isUnits(r)) units = r
    else {
      names = r
      units = null // a units row belongs to the names row above it
    }
  }
  const n = layout.columnCount
  const nameOf = (i: number) => (names?.[i] && names[i] !== '' ? names[i]! : null)
  let timeIndex = 0
  if (names) {
    const t = names.findIndex((s) => /time|^t$|^x$|^sec/i.test(s))
    if (t >= 0) timeIndex = t
  }
  const columns: CaptureColumn[] = []
  let ch = 0
  for (let i = 0; i < n; i++) {
    const isTime = i === timeIndex
    if (!isTime) ch++
    const name = nameOf(i) ?? (isTime ? 'time' : `ch${ch}`)
    const unit = (units?.[i] && units[i] !== '' ? units[i]!.replace(/[()[\]\s]/g, '') : null) ?? unitInName(name)
    const table = isTime ? TIME_UNITS : VOLT_UNITS
    let scale = 1
    if (unit !== null) {
      const f = table[unit.toLowerCase()] ?? table[unit]
      if (f === undefined) warnings.push(`unit "${unit}" of column "${name}" not recognised; its numbers are read as ${isTime ? 'seconds' : 'volts'}`)
      else scale = f
    }
    columns.push({ name, unit, scale })
  }
  const time = columns[timeIndex]!
  return { time, channels: columns.filter((_, i) => i !== timeIndex), timeIndex }
}

/** Grows typed arrays by doubling; the final arrays are trimmed copies. */
class SampleStore {
  private cap = 65536
  time = new Float64Array(this.cap)
  volts: Float32Array[]
  n = 0
  constructor(channels: number) {
    this.volts = Array.from({ length: channels }, () => new Float32Array(this.cap))
  }
  grow(): void {
    this.cap *= 2
    const t = new Float64Array(this.cap)
    t.set(this.time)
    this.time = t
    this.volts = this.volts.map((v) => {
      const w = new Float32Array(this.cap)
      w.set(v)
      return w
    })
  }
  get full(): boolean {
    return this.n === this.cap
  }
  /** views of the filled part (no copy, so the peak stays at the grown capacity) */
  trimmed(): { time: Float64Array; volts: Float32Array[] } {
    return { time: this.time.subarray(0, this.n), volts: this.volts.map((v) => v.subarray(0, this.n)) }
  }
}

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString()
}

/** The columns a capture's data rows are read by, once its layout is known. */
interface DataSection {
  layout: Layout
  format: CaptureFormat
  store: SampleStore
  down: MinMaxDownsampler
  timeIndex: number
  voltIndex: number[]
  timeScale: number
  voltScale: number[]
  names: string[]
  row: Float64Array
  mins: number[]
  maxs: number[]
}

/**
 * A capture read line by line: the first lines are kept until the layout is known (header,
 * delimiter, decimal comma, columns), then every data row is checked and stored.
 */
class CaptureReader {
  private readonly maxSamples: number
  private readonly maxChannels: number
  private readonly maxLineLength: number
  private readonly maxHeaderLines: number
  private readonly detectWindow: number
  private carry = ''
  private lineNo = 0
  /** before the layout is known: the first lines, kept to detect it */
  private headLines: string[] = []
  private headFirstLine = 1
  private prevT = -Infinity
  data: DataSection | null = null

  constructor(private readonly options: ParseOptions) {
    this.maxSamples = options.maxSamples ?? 2_000_000
    this.maxChannels = options.maxChannels ?? 8
    this.maxLineLength = options.maxLineLength ?? 65536
    this.maxHeaderLines = options.maxHeaderLines ?? 200
    this.detectWindow = this.maxHeaderLines + 20
  }

  /** Detect the layout from the kept lines, describe the columns, and replay the kept data rows. */
  startData() {
    const l = detectLayout(this.headLines)
    if (!l || l.dataIndex > this.maxHeaderLines) {
      throw new CaptureFormatError(
        null,
        l ? `no samples in the first ${this.maxHeaderLines} lines` : 'no rows of numbers found: a capture needs a time column and at least one voltage column, separated by commas, tabs or semicolons',
      )
    }
    const warnings: string[] = []
    const cols = describeColumns(this.headLines, l, warnings)
    if (cols.channels.length > this.maxChannels) throw new CaptureFormatError(this.headFirstLine + l.dataIndex, `${cols.channels.length} voltage columns; at most ${this.maxChannels} are accepted`)
    const voltIndex = Array.from({ length: l.columnCount }, (_, i) => i).filter((i) => i !== cols.timeIndex)
    this.data = {
      layout: l,
      format: {
        delimiter: l.delimiter,
        decimalComma: l.decimalComma,
        firstDataLine: this.headFirstLine + l.dataIndex,
        header: this.headLines.slice(0, l.dataIndex).filter((x) => x.trim() !== '').slice(0, 50).map((x) => x.slice(0, 200)),
        time: cols.time,
        channels: cols.channels,
        warnings,
      },
      store: new SampleStore(voltIndex.length),
      down: new MinMaxDownsampler(voltIndex.length, this.options.displayBuckets ?? 1000),
      timeIndex: cols.timeIndex,
      voltIndex,
      timeScale: cols.time.scale,
      voltScale: cols.channels.map((c) => c.scale),
      names: cols.channels.map((c) => c.name),
      row: new Float64Array(voltIndex.length),
      mins: voltIndex.map(() => Infinity),
      maxs: voltIndex.map(() => -Infinity),
    }
    // replay the buffered lines from the first sample on
    const buffered = this.headLines.splice(0)
    for (let i = l.dataIndex; i < buffered.length; i++) this.dataLine(buffered[i]!, this.headFirstLine + i)
  }

  /** One data row: every field a number, time increasing, within the sample limit. */
  private dataLine(line: string, no: number) {
    if (line.length === 0 || line.trim() === '') return
    const d = this.data!
    const l = d.layout
    const f = fieldsOf(line, l.delimiter)
    if (f.length !== l.columnCount) throw new CaptureFormatError(no, `expected ${l.columnCount} numbers, found ${f.length}`)
    const t = toNumber(f[d.timeIndex]!, l.decimalComma) * d.timeScale
    if (!Number.isFinite(t)) throw new CaptureFormatError(no, `column ${d.timeIndex + 1} ("${d.format.time.name}") is not a number: "${clean(f[d.timeIndex]!).slice(0, 40)}"`)
    for (let c = 0; c < d.voltIndex.length; c++) {
      const field = f[d.voltIndex[c]!]!
      const v = toNumber(field, l.decimalComma) * d.voltScale[c]!
      if (!Number.isFinite(v)) throw new CaptureFormatError(no, `column ${d.voltIndex[c]! + 1} ("${d.names[c]}") is not a number: "${clean(field).slice(0, 40)}"`)
      d.row[c] = v
    }
    if (!(t > this.prevT)) throw new CaptureFormatError(no, `time ${fmt(t)} s is not after the previous sample's ${fmt(this.prevT)} s (time must increase)`)
    this.prevT = t
    const st = d.store
    if (st.n >= this.maxSamples) throw new CaptureFormatError(no, `more than ${this.maxSamples} samples; shorten the record or split the capture`)
    if (st.full) st.grow()
    const k = st.n++
    st.time[k] = t
    for (let c = 0; c < d.row.length; c++) {
      const v = d.row[c]!
      st.volts[c]![k] = v
      if (v < d.mins[c]!) d.mins[c] = v
      if (v > d.maxs[c]!) d.maxs[c] = v
    }
    d.down.push(t, d.row)
  }

  /** A line: kept while the layout is unknown, else read as data. */
  line(raw: string) {
    this.lineNo++
    const line = raw.charCodeAt(raw.length - 1) === 13 ? raw.slice(0, -1) : raw
    if (line.length > this.maxLineLength) throw new CaptureFormatError(this.lineNo, `longer than ${this.maxLineLength} characters`)
    if (this.data) this.dataLine(line, this.lineNo)
    else {
      if (this.headLines.length === 0) this.headFirstLine = this.lineNo
      this.headLines.push(line)
      if (this.headLines.length >= this.detectWindow) this.startData()
    }
  }

  /** Decoded text: split into lines, the unfinished last one carried to the next chunk. */
  text(text: string) {
    const nul = text.indexOf('\0')
    if (nul >= 0) throw new CaptureFormatError(this.lineNo + 1 + countNewlines(this.carry + text.slice(0, nul)), 'binary content (NUL byte)')
    const s = this.carry + text
    let from = 0
    for (let nl = s.indexOf('\n', from); nl >= 0; nl = s.indexOf('\n', from)) {
      this.line(s.slice(from, nl))
      from = nl + 1
    }
    this.carry = s.slice(from)
    if (this.carry.length > this.maxLineLength) throw new CaptureFormatError(this.lineNo + 1, `longer than ${this.maxLineLength} characters`)
  }

  /** The end of the input: the last line without a newline, and a layout even when the file was short. */
  end() {
    if (this.carry.length > 0) {
      const last = this.carry
      this.carry = ''
      this.line(last)
    }
    if (!this.data) this.startData()
    return this.data!
  }
}

/**
 * Read a CSV/TSV oscilloscope export from a stream of bytes (a Node Readable, or any
 * async iterable of Uint8Array or string chunks). Throws CaptureFormatError, naming the
 * line, for anything that is not a capture: binary content, no numeric rows, a row
 * with the wrong number of fields or a non-number, time that does not increase, too
 * few or too many samples.
 */
export async function parseCapture(source: AsyncIterable<Uint8Array | string> | Iterable<Uint8Array | string>, options: ParseOptions = {}): Promise<ParsedCapture> {
  const minSamples = options.minSamples ?? 16
  const decoder = new TextDecoder('utf-8')
  const encoder = new TextEncoder()
  const reader = new CaptureReader(options)
  // the first 512 bytes are sniffed (text, not binary) before anything is decoded
  let sniffed = false
  let headBytes = new Uint8Array(0)
  let bytes = 0
  const sniffAndRead = (head: Uint8Array) => {
    const verdict = sniffText(head.subarray(0, 4096))
    if (!verdict.ok) throw new CaptureFormatError(null, verdict.reason)
    reader.text(decoder.decode(head, { stream: true }))
  }
  for await (const chunk of source) {
    const buf = typeof chunk === 'string' ? encoder.encode(chunk) : chunk
    bytes += buf.length
    if (sniffed) reader.text(decoder.decode(buf, { stream: true }))
    else {
      const joined = new Uint8Array(headBytes.length + buf.length)
      joined.set(headBytes)
      joined.set(buf, headBytes.length)
      headBytes = joined
      if (headBytes.length < 512) continue
      sniffed = true
      sniffAndRead(headBytes)
      headBytes = new Uint8Array(0)
    }
    options.onProgress?.(bytes)
  }
  if (!sniffed) {
    sniffAndRead(headBytes)
    options.onProgress?.(bytes)
  }
  reader.text(decoder.decode())
  const d = reader.end()
  const st = d.store
  if (st.n < minSamples) throw new CaptureFormatError(null, `only ${st.n} samples; at least ${minSamples} are needed`)
  const { time, volts } = st.trimmed()
  return {
    format: d.format,
    sampleCount: st.n,
    time,
    channels: volts,
    ranges: d.mins.map((min, c) => ({ min, max: d.maxs[c]! })),
    waveform: d.down.result(d.names),
    bytes,
  }
}

function countNewlines(s: string): number {
  let n = 0
  for (let i = s.indexOf('\n'); i >= 0; i = s.indexOf('\n', i + 1)) n++
  return n
}
