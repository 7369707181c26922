import { LinkSpec } from '../../../../../shared/schemas/link'
import { createLink } from '../../../../domain/links'
import { presentLink } from '../../../../presenters/workspace'

/**
 * Import a link JSON (the export's shape: the shared link schema with schemaVersion) into
 * the project as a new link (engineer, admin). 201; 400 with one issue per problem, each
 * naming its field.
 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, role, user } = await requireProject(event, projectId, 'link.create')
  const spec = await validBody(event, LinkSpec)
  const link = await createLink(project, user.id, spec)
  setResponseStatus(event, 201)
  return presentLink(link, role)
})
