/**
 * What a capture measured (timing-model.md section 6): the extraction's result contract,
 * defined once here and imported by the capture reader (server/captures), the API, the UI,
 * "apply to stage" and the frozen report. Times in seconds, levels in volts.
 */
import type { CaptureOptions, CaptureStatus } from '../schemas/capture'

/** Count, min, mean, max and sample standard deviation of a set of values (seconds). */
export interface SummaryStats {
  count: number
  min: number
  mean: number
  max: number
  /** sample standard deviation (n - 1 in the denominator); 0 for a single value */
  sigma: number
}

/** The two state levels of a two-level waveform and its reference levels (volts). */
export interface StateLevels {
  /** low state level (0 % reference) */
  low: number
  /** high state level (100 % reference) */
  high: number
  /** high - low */
  amplitude: number
  /** 10 % reference level: low + 0.1 amplitude */
  ref10: number
  /** 50 % (mesial) reference level */
  ref50: number
  /** 90 % reference level */
  ref90: number
  /** rms spread of the samples within 10 % of the amplitude around each state level */
  noiseLow: number
  noiseHigh: number
  /** histogram bins used */
  bins: number
}

export type Polarity = 'rising' | 'falling'

/** One transition of a channel. Times in seconds from the capture's time origin. */
export interface Edge {
  polarity: Polarity
  /** 50 % reference level instant, linearly interpolated between the two samples that straddle it */
  t50: number
  /** 10 % reference level instant of this transition, or null if the capture does not show it */
  t10: number | null
  /** 90 % reference level instant, or null */
  t90: number | null
  /** seconds: transition duration, 10 % to 90 % (rising) or 90 % to 10 % (falling); null when an instant is missing */
  duration: number | null
}

/** One input edge and the output edge it caused. */
export interface EdgePair {
  /** seconds: the input edge's 50 % instant */
  input: number
  /** seconds: the output edge's 50 % instant */
  output: number
  /** seconds, 50 % to 50 % */
  delay: number
  /** JEDEC naming by the OUTPUT's direction: tPLH when the output rises, tPHL when it falls */
  kind: 'tPLH' | 'tPHL'
}

export interface Pairing {
  inverting: boolean
  /** 'given' when the caller said whether the path inverts, 'detected' otherwise */
  inversionSource: 'given' | 'detected'
  /** detected only: fraction of input edges whose next output edge agreed with the decision (0-1) */
  inversionAgreement: number | null
  /** every pair, in time order */
  pairs: EdgePair[]
  /** seconds, 50 % to 50 %, output rising */
  tPLH: SummaryStats | null
  /** seconds, 50 % to 50 %, output falling */
  tPHL: SummaryStats | null
  /** seconds: mean tPLH - mean tPHL (the measured pulse-width distortion, signed), null unless both exist */
  pwd: number | null
  /** input edges for which no output edge of the expected direction followed in time */
  unpairedInputEdges: number
}

export type Delimiter = ',' | '\t' | ';'

/** One column of the capture as the file names it. */
export interface CaptureColumn {
  /** the column name from the file's name row, or "time" / "ch1", "ch2" ... */
  name: string
  /** the unit as written in the file ("s", "us", "mV"), or null if none was given */
  unit: string | null
  /** factor that converts the file's numbers to SI (seconds or volts) */
  scale: number
}

/** What the reader learned about the file's layout. */
export interface CaptureFormat {
  delimiter: Delimiter
  /** true when numbers use a decimal comma (semicolon- or tab-separated files only) */
  decimalComma: boolean
  /** 1-based line number of the first sample */
  firstDataLine: number
  /** the header lines before the data (metadata, names, units), at most 50 kept, each cut to 200 characters */
  header: string[]
  time: CaptureColumn
  channels: CaptureColumn[]
  warnings: string[]
}

/** A capture reduced for display: per bucket of consecutive samples, the min and max. */
export interface CaptureWaveform {
  /** samples per bucket (a power of two; the last bucket may hold fewer) */
  samplesPerBucket: number
  /** seconds: the time of each bucket's first sample */
  t: number[]
  channels: { name: string; /** volts */ min: number[]; /** volts */ max: number[] }[]
}

/** One voltage channel of a capture: its levels, edges and transition times. */
export interface CaptureChannelResult {
  name: string
  unit: string | null
  /** null for a flat channel */
  levels: StateLevels | null
  /** volts: hysteresis thresholds, null for a flat channel */
  thresholds: { lower: number; upper: number } | null
  edgeCount: number
  risingCount: number
  fallingCount: number
  /** the first maxListed edges */
  edges: Edge[]
  edgesTruncated: boolean
  /** seconds: 10-90 % transition durations of the rising edges */
  tr: SummaryStats | null
  /** seconds: 90-10 % transition durations of the falling edges */
  tf: SummaryStats | null
}

export interface PairingResult extends Omit<Pairing, 'pairs'> {
  /** channel indices (among the voltage columns) */
  input: number
  output: number
  /** the first maxListed pairs */
  pairs: EdgePair[]
  pairsTruncated: boolean
  pairCount: number
}

/** What a capture measured: JSON-safe, no NaN or infinity. */
export interface CaptureResult {
  /** the extraction method's version (server/captures/analyse.ts CAPTURE_METHOD_VERSION) */
  method: string
  format: CaptureFormat
  sampleCount: number
  /** seconds */
  timeStart: number
  timeEnd: number
  /** seconds: mean sample interval */
  sampleInterval: number
  channels: CaptureChannelResult[]
  pairing: PairingResult | null
  warnings: string[]
}

/**
 * A capture's measurement as lists carry it: every count, level and statistic, without the
 * edge and pair lists or the file's header lines (those make a result some 100 kB to 500 kB;
 * GET /api/captures/:id returns the whole result).
 */
export interface CaptureResultSummary extends Omit<CaptureResult, 'format' | 'channels' | 'pairing'> {
  format: Omit<CaptureFormat, 'header'>
  channels: Omit<CaptureChannelResult, 'edges'>[]
  pairing: Omit<PairingResult, 'pairs'> | null
}

/** A capture as lists return it (never the waveform: that is its own route). */
export interface CaptureDto {
  id: number
  linkId: number
  label: string
  /** the uploaded file's name, for display only (the storage key is the server's) */
  fileName: string
  /** bytes */
  size: number
  contentType: string
  /** hex SHA-256 of the stored bytes */
  sha256: string
  options: CaptureOptions
  status: CaptureStatus
  /** 0..1 while the extraction runs */
  progress: number
  /** why the capture could not be read (names the line when one is at fault) */
  error: string | null
  /** the measurement's summary, once status is done */
  result: CaptureResultSummary | null
  owner: { id: number; name: string } | null
  createdAt: string
}

/** One capture with its whole measurement (GET /api/captures/:id). */
export interface CaptureDetailDto extends CaptureDto {
  result: CaptureResult | null
}

export interface DatasheetDto {
  id: number
  partId: number
  fileName: string
  size: number
  sha256: string
  owner: { id: number; name: string } | null
  createdAt: string
}
