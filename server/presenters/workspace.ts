/** Project, link and part DTOs (shared/types/workspace.ts) from models. */
import type { Role } from '../../shared/schemas/roles'
import type { LinkDto, LinkSummaryDto, LinkSummaryFields, PartDto, ProjectDetailDto, ProjectDto, SignOffRef } from '../../shared/types/workspace'
import type { Link, Part, Project } from '../db/models'

export function presentProject(p: Project, linkCount: number): ProjectDto {
  return {
    id: p.id,
    teamId: p.teamId,
    name: p.name,
    description: p.description,
    version: p.version,
    linkCount,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  }
}

export function presentLinkSummary(l: Link, signedOff?: SignOffRef | null): LinkSummaryDto {
  return {
    id: l.id,
    name: l.name,
    protocol: l.protocol,
    version: l.version,
    ...summaryFields(l.summary),
    updatedAt: l.updatedAt.toISOString(),
    ...(signedOff !== undefined ? { signedOff } : {}),
  }
}

/** The stored analysis summary as the DTOs carry it (a summary saved before a field existed reads null there). */
function summaryFields(sm: LinkSummaryFields | null | undefined): LinkSummaryFields {
  return {
    verdict: sm?.verdict ?? null,
    ...(sm?.missingValues !== undefined ? { missingValues: sm.missingValues } : {}),
    worstMarginUi: sm?.worstMarginUi ?? null,
    worstSlack: sm?.worstSlack ?? null,
    maxBaud: sm?.maxBaud ?? null,
    maxSclkHz: sm?.maxSclkHz ?? null,
    maxSclHz: sm?.maxSclHz ?? null,
    maxBusLength: sm?.maxBusLength ?? null,
    limitingCheck: sm?.limitingCheck ?? null,
    engineVersion: sm?.engineVersion ?? null,
  }
}

/** A project with the first page of its links; linkCount counts them all. */
export function presentProjectDetail(p: Project, links: Link[], role: Role, linkCount = links.length, signOffs?: Map<number, SignOffRef>): ProjectDetailDto {
  return { ...presentProject(p, linkCount), role, links: links.map((l) => presentLinkSummary(l, signOffs ? (signOffs.get(l.id) ?? null) : undefined)) }
}

export function presentLink(l: Link, role: Role, signedOff?: SignOffRef | null): LinkDto {
  return {
    id: l.id,
    projectId: l.projectId,
    teamId: l.teamId,
    name: l.name,
    version: l.version,
    spec: l.spec,
    summary: summaryFields(l.summary),
    createdAt: l.createdAt.toISOString(),
    updatedAt: l.updatedAt.toISOString(),
    updatedBy: l.updater ? { id: l.updater.id, name: l.updater.name } : null,
    role,
    ...(signedOff !== undefined ? { signedOff } : {}),
  }
}

export function presentPart(p: Part): PartDto {
  return {
    id: p.id,
    teamId: p.teamId,
    name: p.name,
    category: p.category,
    description: p.description,
    builtIn: p.teamId === null,
    version: p.version,
    stage: p.stage,
    updatedAt: p.updatedAt.toISOString(),
  }
}
