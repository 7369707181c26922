import { Op, type Transaction } from 'sequelize'
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

/** The team's audit log, newest first. */
export function listAudit(teamId: number, opts: { limit: number; before?: number }) {
  return AuditEntry.findAll({
    where: { teamId, ...(opts.before ? { id: { [Op.lt]: opts.before } } : {}) },
    include: [{ association: 'user', attributes: ['id', 'name', 'email'] }],
    order: [['id', 'DESC']],
    limit: opts.limit,
  })
}
