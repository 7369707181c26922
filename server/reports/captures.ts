/**
 * The scope captures a revision freezes (issue 7: "the report shows the captures that back
 * a revision"). Pure: the freeze passes the link's done captures and the frozen input, and
 * gets the snapshot stored with the revision; the unit tests call the same function.
 */
import type { Link } from '../../shared/schemas/link'
import type { CaptureApplication, FrozenCapture, FrozenCaptureChannel } from '../../shared/types/report'
import { delayCorners } from '../../shared/utils/capture-apply'
import type { CaptureOptions } from '../../shared/schemas/capture'
import type { CaptureResult } from '../captures/analyse'
import type { SummaryStats } from '../captures/stats'

/** What the snapshot reads of a capture row (a model instance or a plain object). */
export interface CaptureSource {
  id: number
  label: string
  fileName: string
  sha256: string
  /** bytes; BIGINT arrives from pg as a string */
  size: number | string
  options: CaptureOptions
  result: CaptureResult | null
  createdAt: Date
  owner?: { id: number; name: string } | null
}

/** Equal to a relative 1e-9 (values went through JSON on both sides, so they are normally identical). */
function same(a: number | undefined, b: number | undefined): boolean {
  if (a === undefined || b === undefined) return false
  return Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b), 1e-15)
}

/**
 * The stage whose values are exactly what "apply to stage" (shared/utils/capture-apply.ts)
 * makes of this capture: a digital stage whose tPLH and tPHL corners are the measured
 * corners, or a phototransistor point whose tPLH and tPHL are the measured means (at the
 * capture's RL when one was given). Null when no stage matches: then nothing is claimed.
 */
export function findApplication(input: Link, result: CaptureResult, options: CaptureOptions): CaptureApplication | null {
  const p = result.pairing
  if (!p?.tPLH || !p.tPHL) return null
  const plh = delayCorners(p.tPLH)
  const phl = delayCorners(p.tPHL)
  for (const ch of input.channels) {
    for (const [stageIndex, s] of ch.stages.entries()) {
      if (s.kind === 'digital') {
        const match = same(s.tplh.min, plh.min) && same(s.tplh.typ, plh.typ) && same(s.tplh.max, plh.max) && same(s.tphl.min, phl.min) && same(s.tphl.typ, phl.typ) && same(s.tphl.max, phl.max)
        if (match) return { channelId: ch.id, stageIndex, stageName: s.name, as: 'typical' }
      } else if (s.kind === 'phototransistor') {
        const point = s.characterization.find((c) => (options.rl === undefined || same(c.rl, options.rl)) && same(c.tplh, p.tPLH!.mean) && same(c.tphl, p.tPHL!.mean))
        if (point) return { channelId: ch.id, stageIndex, stageName: s.name, as: 'characterization' }
      }
    }
  }
  return null
}

const stats = (s: SummaryStats | null | undefined): SummaryStats | null => (s ? { count: s.count, min: s.min, mean: s.mean, max: s.max, sigma: s.sigma } : null)

function channel(result: CaptureResult, index: number | null | undefined): FrozenCaptureChannel | null {
  if (index === null || index === undefined) return null
  const c = result.channels[index]
  if (!c) return null
  return { number: index + 1, name: c.name, tr: stats(c.tr), tf: stats(c.tf) }
}

/** The snapshot of one capture whose extraction is done; null for any other (no result yet, or failed). */
export function freezeCapture(c: CaptureSource, input: Link): FrozenCapture | null {
  const r = c.result
  if (!r) return null
  const p = r.pairing
  const applied = findApplication(input, r, c.options)
  return {
    id: c.id,
    label: c.label,
    fileName: c.fileName,
    sha256: c.sha256,
    size: Number(c.size),
    uploadedBy: c.owner ? { id: c.owner.id, name: c.owner.name } : null,
    uploadedAt: c.createdAt.toISOString(),
    input: channel(r, p ? p.input : (c.options.input ?? 0)),
    output: channel(r, p ? p.output : null),
    inverting: p ? p.inverting : null,
    sampleCount: r.sampleCount,
    ...(c.options.rl !== undefined ? { rl: c.options.rl } : {}),
    tPLH: stats(p?.tPLH),
    tPHL: stats(p?.tPHL),
    method: r.method,
    ...(applied ? { appliedTo: applied } : {}),
  }
}

/** Snapshots of the captures (oldest first) whose extraction is done. */
export function freezeCaptures(captures: readonly CaptureSource[], input: Link): FrozenCapture[] {
  return [...captures]
    .sort((a, b) => a.id - b.id)
    .map((c) => freezeCapture(c, input))
    .filter((c): c is FrozenCapture => c !== null)
}
