/** The part library: built-in parts (team_id NULL, read-only) plus each team's own. */
import { Op } from 'sequelize'
import type { PartCreateBody, PartPatchBody } from '../../shared/schemas/part'
import { Part } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError } from '../utils/errors'
import type { Page } from '../utils/paging'
import { presentPart } from '../presenters/workspace'
import { audit } from './audit'

/** Built-in parts first, then the team's, each by category and name. */
export function listParts(teamId: number, page: Page) {
  return Part.findAndCountAll({
    where: { [Op.or]: [{ teamId: null }, { teamId }] },
    order: [[useDb().literal('team_id IS NOT NULL'), 'ASC'], ['category', 'ASC'], ['name', 'ASC'], ['id', 'ASC']],
    limit: page.limit,
    offset: page.offset,
  })
}

export async function createPart(teamId: number, userId: number, body: PartCreateBody) {
  return useDb().transaction(async (transaction) => {
    const part = await Part.create({ teamId, ...body, createdBy: userId, updatedBy: userId }, { transaction })
    await audit(transaction, { teamId, userId, action: 'part.create', entity: 'part', entityId: part.id, detail: { name: part.name, category: part.category } })
    return part
  })
}

export async function updatePart(part: Part, userId: number, body: PartPatchBody) {
  const { version, ...changes } = body
  const defined = Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined))
  return useDb().transaction(async (transaction) => {
    const [n] = await Part.update({ ...defined, version: version + 1, updatedBy: userId }, { where: { id: part.id, version }, transaction })
    const current = await Part.findByPk(part.id, { transaction, rejectOnEmpty: true })
    if (n === 0)
      throw new ConflictError('the part was changed by someone else; reload it and apply your edit again', {
        currentVersion: current.version,
        part: presentPart(current),
      })
    await audit(transaction, { teamId: part.teamId!, userId, action: 'part.update', entity: 'part', entityId: part.id, detail: { fromVersion: version, toVersion: current.version, fields: Object.keys(defined) } })
    return current
  })
}

export async function deletePart(part: Part, userId: number) {
  await useDb().transaction(async (transaction) => {
    await audit(transaction, { teamId: part.teamId!, userId, action: 'part.delete', entity: 'part', entityId: part.id, detail: { name: part.name } })
    await part.destroy({ transaction })
  })
}
