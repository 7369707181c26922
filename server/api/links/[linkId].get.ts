import { Project } from '../../db/models'
import { signOffOf } from '../../domain/sign-offs'
import { presentLink } from '../../presenters/workspace'

/** A link with its spec, version, last editor, the caller's role, its project's name, and its latest sign-off (changed since?). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, role } = await requireLink(event, linkId, 'link.read')
  const [signedOff, project] = await Promise.all([signOffOf(link), Project.findByPk(link.projectId, { attributes: ['name'] })])
  return { ...presentLink(link, role, signedOff), projectName: project?.name ?? '' }
})
