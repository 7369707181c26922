/**
 * Margin report DTOs (issue 6). A report is a series of revisions r1, r2 ... of one link;
 * each revision freezes the link's input and the engine's full result and never changes.
 * Only its review state moves: draft -> submitted -> signed off | returned. Dates are
 * ISO 8601 strings; every number inside `result` is the engine's own (SI units).
 */
import type { SummaryStats } from './capture'
import type { LinkAnalysis, PullupSweepResult } from './analysis'
import type { Link } from '../schemas/link'
import type { ReportState, CommentTarget } from '../schemas/report'
import type { PersonRef } from './workspace'
import type { ReadingThresholds } from '../report/vocabulary'

export type { ReportState, CommentTarget }

/** The pull-up sweep stored with a revision, and the row the link uses now. */
export interface PullupChoice {
  sweep: PullupSweepResult
  /** index in sweep.rows of the row whose RL is the stage's RL, null when the RL is not in the series */
  chosenRow: number | null
  /** the stage's pull-up and LED resistor as frozen, ohms */
  rl: number
  rLed: number | null
}

/** One voltage channel of a capture, as frozen with a revision. */
export interface FrozenCaptureChannel {
  /** 1-based, as the user sees it (the first voltage column is channel 1) */
  number: number
  /** the column's name in the file */
  name: string
  /** seconds: 10-90 % durations of the channel's rising edges */
  tr: SummaryStats | null
  /** seconds: 90-10 % durations of the falling edges */
  tf: SummaryStats | null
}

/** Where a capture's measured values sit in the frozen input (only when they match it exactly). */
export interface CaptureApplication {
  channelId: string
  /** 0-based index in the channel's stages */
  stageIndex: number
  stageName: string
  /** typical values and spread of a digital stage, or a characterisation point of a phototransistor stage */
  as: 'typical' | 'characterization'
}

/**
 * A scope capture that backs a revision: a snapshot taken at freeze (issue 7), so it
 * stays as it was when the capture is later deleted. Numbers are SI (seconds, bytes, ohms).
 */
export interface FrozenCapture {
  id: number
  label: string
  /** the uploaded file's name, display only */
  fileName: string
  /** hex SHA-256 of the stored bytes */
  sha256: string
  /** bytes */
  size: number
  uploadedBy: PersonRef | null
  /** ISO 8601 */
  uploadedAt: string
  /** the path's input channel */
  input: FrozenCaptureChannel | null
  /** the path's output channel; null when the capture was not paired */
  output: FrozenCaptureChannel | null
  /** whether the path inverts, null without pairing */
  inverting: boolean | null
  sampleCount: number
  /** ohms: the pull-up the capture was taken at, when given at upload */
  rl?: number
  /** seconds, 50 % to 50 %, output rising */
  tPLH: SummaryStats | null
  /** seconds, 50 % to 50 %, output falling */
  tPHL: SummaryStats | null
  /** extraction method version */
  method: string
  /** present only when the frozen input holds exactly the values "apply to stage" makes of this capture */
  appliedTo?: CaptureApplication
}

/** A frozen capture in the report DTO. */
export interface ReportCaptureDto extends FrozenCapture {
  /** the capture still exists: its file can be downloaded from /captures/:id/file */
  available: boolean
}

/** A revision as lists show it. */
export interface ReportSummaryDto {
  id: number
  /** 1 for r1 */
  number: number
  /** "r1" */
  label: string
  linkId: number
  linkName: string
  projectId: number
  projectName: string
  teamId: number
  protocol: Link['protocol']
  state: ReportState
  verdict: 'pass' | 'marginal' | 'fail'
  engineVersion: string
  author: PersonRef | null
  reviewer: PersonRef | null
  createdAt: string
  submittedAt: string | null
  decidedAt: string | null
}

/** One step of the review: who did what, when. */
export interface ReportEventDto {
  id: number
  action: 'freeze' | 'submit' | 'sign-off' | 'return'
  actor: PersonRef | null
  /** the reviewer named by a submit */
  reviewer: PersonRef | null
  note: string | null
  at: string
}

export interface ReportCommentDto {
  id: number
  target: CommentTarget
  body: string
  author: PersonRef | null
  createdAt: string
}

/** What the caller may do with this revision now (the server enforces the same rules). */
export interface ReportAbilities {
  submit: boolean
  comment: boolean
  decide: boolean
  /** freeze a newer revision of the link */
  freeze: boolean
}

/** A whole revision: the frozen input, the frozen result, its review. */
export interface ReportDetailDto extends ReportSummaryDto {
  /** the link's version the revision was frozen from */
  linkVersion: number
  /** the full link input (defaults filled in) */
  input: Link
  /** the engine's full result at freeze time */
  result: LinkAnalysis
  assumptions: string[]
  pullup: PullupChoice | null
  /** the team's reading thresholds frozen with the revision; null on revisions frozen before them (read by the requirement alone) */
  thresholds: ReadingThresholds | null
  /** the scope captures of the link whose extraction was done at freeze, oldest first */
  captures: ReportCaptureDto[]
  decidedBy: PersonRef | null
  /** the reviewer's note with a sign-off or a return */
  decisionNote: string | null
  /** optimistic-locking counter of the review state */
  version: number
  events: ReportEventDto[]
  comments: ReportCommentDto[]
  /** the caller's role in the team and what it allows here */
  role: 'admin' | 'engineer' | 'reviewer' | 'viewer'
  can: ReportAbilities
  /** the newest revision of the same link (to tell an old revision apart) */
  latestNumber: number
}

/** One difference between the stored result and today's engine, by JSON path. */
export interface ResultDifference {
  path: string
  stored: unknown
  recomputed: unknown
}

export interface RecomputeDto {
  reportId: number
  storedEngineVersion: string
  currentEngineVersion: string
  /** the recomputed result equals the stored one (numbers to a relative 1e-9) */
  same: boolean
  /** at most 200 differences, first by path order */
  differences: ResultDifference[]
  differenceCount: number
  verdict: { stored: string; recomputed: string }
}

/** A member of the team who can review (reviewer or admin), for the submit form. */
export interface ReviewerOption {
  id: number
  name: string
  role: 'admin' | 'reviewer'
}

/** One entry of the review queue: a submitted revision waiting for the caller. */
export interface ReviewQueueItemDto extends ReportSummaryDto {
  /** named to the caller (true) or waiting for any reviewer of the team (false) */
  assignedToMe: boolean
}

/** Each link's latest revision, for the project page. */
export interface LatestRevisionDto {
  linkId: number
  reportId: number
  label: string
  state: ReportState
  verdict: 'pass' | 'marginal' | 'fail'
  createdAt: string
}

/** One side of a comparison: a revision (with its review state), or the link as saved now (`version N`, no state). */
export interface ComparisonSide {
  id: number
  label: string
  verdict: string
  linkVersion: number
  state?: ReportState
}

/**
 * Two revisions of one link compared (GET /api/reports/:id/compare), or a signed-off revision
 * against the link as saved now (GET /api/links/:id/since-sign-off): what changed between them.
 */
export interface RevisionComparisonDto {
  from: ComparisonSide
  to: ComparisonSide
  verdict: { a: string; b: string }
  /** input changes by settings and by stage */
  inputs: import('../report/compare').InputGroup[]
  /** margin changes, biggest first */
  margins: import('../report/compare').MarginChange[]
}
