import { FreezeBody } from '../../../../../shared/schemas/report'
import { freezeRevision } from '../../../../domain/reports'
import { presentReport } from '../../../../presenters/report'

/** Freeze the saved link and its analysis into the next revision, a draft (engineer, admin). 201. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, role, user } = await requireLink(event, linkId, 'report.create')
  const body = await validBody(event, FreezeBody)
  const rev = await freezeRevision(link, user.id, body)
  setResponseStatus(event, 201)
  return presentReport(rev, role, user.id, rev.number)
})
