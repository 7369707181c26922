/**
 * The summary of a capture's measurement that lists carry (shared/types/capture.ts
 * CaptureResultSummary): the whole result minus its edge list, pair list and header lines.
 * Written once when the extraction finishes, so a list never reads the full result.
 */
import type { CaptureResult, CaptureResultSummary } from '../types/capture'

export function summariseCaptureResult(r: CaptureResult): CaptureResultSummary {
  const { header: _header, ...format } = r.format
  return {
    method: r.method,
    format,
    sampleCount: r.sampleCount,
    timeStart: r.timeStart,
    timeEnd: r.timeEnd,
    sampleInterval: r.sampleInterval,
    channels: r.channels.map(({ edges: _edges, ...channel }) => channel),
    pairing: r.pairing ? (({ pairs: _pairs, ...pairing }) => pairing)(r.pairing) : null,
    warnings: r.warnings,
  }
}
