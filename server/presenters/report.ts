/** Margin report DTOs (shared/types/report.ts) from models. */
import { revisionLabel } from '../../shared/schemas/report'
import type { Role } from '../../shared/schemas/roles'
import type { LatestRevisionDto, RecomputeDto, ReportCommentDto, ReportDetailDto, ReportSummaryDto, ReviewQueueItemDto } from '../../shared/types/report'
import type { ReportComment, ReportRevision, User } from '../db/models'
import { abilities } from '../domain/reports'
import type { recomputeRevision } from '../reports/freeze'

const person = (u: Pick<User, 'id' | 'name'> | null | undefined) => (u ? { id: u.id, name: u.name } : null)
const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

export function presentReportSummary(r: ReportRevision): ReportSummaryDto {
  return {
    id: r.id,
    number: r.number,
    label: revisionLabel(r.number),
    linkId: r.linkId ?? 0,
    linkName: r.linkName,
    projectId: r.projectId ?? 0,
    projectName: r.projectName,
    teamId: r.teamId,
    protocol: r.protocol,
    state: r.state,
    verdict: r.verdict,
    engineVersion: r.engineVersion,
    author: person(r.author),
    reviewer: person(r.reviewer),
    createdAt: r.createdAt.toISOString(),
    submittedAt: iso(r.submittedAt),
    decidedAt: iso(r.decidedAt),
  }
}

export function presentComment(c: ReportComment): ReportCommentDto {
  return { id: c.id, target: c.target, body: c.body, author: person(c.author), createdAt: c.createdAt.toISOString() }
}

export function presentReport(r: ReportRevision, role: Role, userId: number, latestNumber: number): ReportDetailDto {
  return {
    ...presentReportSummary(r),
    linkVersion: r.linkVersion,
    input: r.input,
    result: r.result,
    assumptions: r.assumptions,
    pullup: r.pullup,
    thresholds: r.thresholds ?? null,
    captures: (r.captures ?? []).map((c) => ({ ...c, available: (r.liveCaptureIds ?? []).includes(c.id) })),
    decidedBy: person(r.decider),
    decisionNote: r.decisionNote ?? null,
    version: r.version,
    events: (r.events ?? []).map((e) => ({ id: e.id, action: e.action, actor: person(e.actor), reviewer: person(e.reviewer), note: e.note, at: e.at.toISOString() })),
    comments: (r.comments ?? []).map(presentComment),
    role,
    can: abilities(r, role, userId),
    latestNumber,
  }
}

export function presentQueueItem(r: ReportRevision, userId: number): ReviewQueueItemDto {
  return { ...presentReportSummary(r), assignedToMe: r.reviewerId === userId }
}

export function presentLatest(r: ReportRevision): LatestRevisionDto {
  return { linkId: r.linkId!, reportId: r.id, label: revisionLabel(r.number), state: r.state, verdict: r.verdict, createdAt: r.createdAt.toISOString() }
}

export function presentRecompute(r: ReportRevision, c: ReturnType<typeof recomputeRevision>): RecomputeDto {
  return {
    reportId: r.id,
    storedEngineVersion: r.engineVersion,
    currentEngineVersion: c.recomputed.engineVersion,
    same: c.same,
    differences: c.differences,
    differenceCount: c.differenceCount,
    verdict: { stored: r.result.verdict, recomputed: c.recomputed.verdict },
  }
}
