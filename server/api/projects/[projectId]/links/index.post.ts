import { LinkCreateBody } from '../../../../../shared/schemas/analyze'
import { createLink } from '../../../../domain/links'
import { presentLink } from '../../../../presenters/workspace'

/** Add a link {spec} to the project (engineer, admin). 201; 400 naming the field (`spec.…`). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, role, user } = await requireProject(event, projectId, 'link.create')
  const { spec } = await validBody(event, LinkCreateBody)
  const link = await createLink(project, user.id, spec)
  setResponseStatus(event, 201)
  return presentLink(link, role)
})
