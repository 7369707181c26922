import { ProjectCreateBody } from '../../../../../shared/schemas/project'
import { createProject } from '../../../../domain/projects'
import { presentProject } from '../../../../presenters/workspace'

/** Create a project (engineer, admin). 201. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  const { user } = await requireRole(event, teamId, 'project.create')
  const body = await validBody(event, ProjectCreateBody)
  const project = await createProject(teamId, user.id, body)
  setResponseStatus(event, 201)
  return presentProject(project, 0)
})
