/**
 * Links: one JSONB document validated by LinkSpec, its analysis summary cached at save
 * time, and a version that every update must name (a stale one is a 409 carrying the
 * current link, never a silent overwrite).
 */
import type { Link as LinkSpec } from '../../shared/schemas/link'
import { checkLinkDraft } from '../../shared/schemas/linkDraft'
import type { LinkSummaryFields } from '../../shared/types/workspace'
import type { Role } from '../../shared/schemas/roles'
import { Link, User, type Project } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError } from '../utils/errors'
import { presentLink } from '../presenters/workspace'
import { analyzeAndSummarize, incompleteSummary } from './analysis'
import { audit } from './audit'

const withUpdater = { model: User, as: 'updater', attributes: ['id', 'name'] }

/**
 * What a save stores: the parsed link and its analysis summary, or, for a draft with values
 * still to enter, the draft as sent and an "incomplete" summary (validated by LinkDraftSpec:
 * its only problems are missing values).
 */
function stored(input: unknown): { spec: LinkSpec; summary: LinkSummaryFields } {
  const check = checkLinkDraft(input)
  if (check.link) return { spec: check.link, summary: analyzeAndSummarize(check.link) }
  // a draft keeps its nulls (values to enter); its identity fields are validated like a link's
  return { spec: input as LinkSpec, summary: incompleteSummary(check.missing.length) }
}

export async function createLink(project: Project, userId: number, input: unknown) {
  const { spec, summary } = stored(input)
  return useDb().transaction(async (transaction) => {
    const link = await Link.create(
      { projectId: project.id, teamId: project.teamId, name: spec.name, protocol: spec.protocol, spec, summary, createdBy: userId, updatedBy: userId },
      { transaction },
    )
    await audit(transaction, { teamId: project.teamId, userId, action: 'link.create', entity: 'link', entityId: link.id, detail: { projectId: project.id, name: spec.name, verdict: summary.verdict } })
    await link.reload({ include: [withUpdater], transaction })
    return link
  })
}

export async function updateLink(link: Link, role: Role, userId: number, version: number, input: unknown) {
  const { spec, summary } = stored(input)
  return useDb().transaction(async (transaction) => {
    const [n] = await Link.update(
      { spec, summary, name: spec.name, protocol: spec.protocol, version: version + 1, updatedBy: userId },
      { where: { id: link.id, version }, transaction },
    )
    const current = await Link.findByPk(link.id, { include: [withUpdater], transaction, rejectOnEmpty: true })
    if (n === 0)
      throw new ConflictError('the link was changed by someone else; reload it or compare before saving again', {
        currentVersion: current.version,
        link: presentLink(current, role),
      })
    await audit(transaction, {
      teamId: link.teamId,
      userId,
      action: 'link.update',
      entity: 'link',
      entityId: link.id,
      detail: { fromVersion: version, toVersion: current.version, name: spec.name, verdict: summary.verdict },
    })
    return current
  })
}

export async function deleteLink(link: Link, userId: number) {
  await useDb().transaction(async (transaction) => {
    await audit(transaction, { teamId: link.teamId, userId, action: 'link.delete', entity: 'link', entityId: link.id, detail: { projectId: link.projectId, name: link.name } })
    await link.destroy({ transaction })
  })
}
