import { literal, Op, where, type Transaction, type WhereOptions } from 'sequelize'
import { AuditEntry } from '../db/models'

export interface AuditInput {
  teamId: number
  userId: number | null
  /** '<entity>.<verb>', e.g. 'link.update' */
  action: string
  entity: string
  entityId: number | null
  detail?: Record<string, unknown>
}

/** Write one audit row inside the transaction of the change it records. */
export async function audit(transaction: Transaction, entry: AuditInput): Promise<void> {
  await AuditEntry.create({ ...entry, detail: entry.detail ?? {} }, { transaction })
}

/**
 * The team's audit log, newest first, a page at a time (`before`: entries older than that id).
 * `linkId` keeps the entries about one link (the link itself, its captures and its report
 * revisions); `action` one event ('report.sign-off') or a family of them ('report').
 */
export function listAudit(teamId: number, opts: { limit: number; before?: number; linkId?: number; action?: string }) {
  const and: WhereOptions[] = [{ teamId }]
  if (opts.before) and.push({ id: { [Op.lt]: opts.before } })
  if (opts.action) and.push(opts.action.includes('.') ? { action: opts.action } : { action: { [Op.startsWith]: `${opts.action}.` } })
  if (opts.linkId !== undefined) {
    const id = Number(opts.linkId)
    and.push({
      [Op.or]: [
        { entity: 'link', entityId: id },
        where(literal(`("AuditEntry"."detail"->>'linkId')`), String(id)),
        { entity: 'report', entityId: { [Op.in]: literal(`(SELECT id FROM report_revisions WHERE link_id = ${id})`) } },
      ],
    })
  }
  return AuditEntry.findAll({
    where: { [Op.and]: and },
    include: [{ association: 'user', attributes: ['id', 'name', 'email'] }],
    order: [['id', 'DESC']],
    limit: opts.limit,
  })
}
