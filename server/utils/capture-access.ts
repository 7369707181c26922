/**
 * Guards for captures and datasheets, the same way as server/utils/access.ts: the row is
 * joined to the caller's membership of its team, so a foreign id is a plain 404; the
 * permission is the parent's (a capture is part of its link, a datasheet of its part).
 */
import type { H3Event } from 'h3'
import { can, type Action } from '../../shared/permissions'
import { Capture, Membership, PartDatasheet, User } from '../db/models'
import { ForbiddenError, NotFoundError } from './errors'

const accessJoin = (userId: number) => ({ model: Membership, as: 'access', where: { userId }, required: true, attributes: ['role'] })
const ownerJoin = { model: User, as: 'owner', attributes: ['id', 'name'] }

/** The capture (without its waveform unless asked; with it, without the full result) if the caller's team owns it. */
export async function requireCapture(event: H3Event, captureId: number, action: Action, opts: { waveform?: boolean } = {}) {
  const user = await requireUser(event)
  const capture = await Capture.findOne({
    where: { id: captureId },
    include: [accessJoin(user.id), ownerJoin],
    attributes: { exclude: opts.waveform ? ['result'] : ['waveform'] },
  })
  if (!capture?.access) throw new NotFoundError('capture')
  const role = scopedRole(event, capture.teamId, capture.access.role, 'capture')
  if (!can(role, action)) throw new ForbiddenError(`a ${role} may not do this (${action})`)
  return { user, role, capture }
}

export async function requireDatasheet(event: H3Event, datasheetId: number, action: Action) {
  const user = await requireUser(event)
  const datasheet = await PartDatasheet.findOne({ where: { id: datasheetId }, include: [accessJoin(user.id), ownerJoin] })
  if (!datasheet?.access) throw new NotFoundError('datasheet')
  const role = scopedRole(event, datasheet.teamId, datasheet.access.role, 'datasheet')
  if (!can(role, action)) throw new ForbiddenError(`a ${role} may not do this (${action})`)
  return { user, role, datasheet }
}
