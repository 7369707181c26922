import { ProjectPatchBody } from '../../../shared/schemas/project'
import { countLinks, linksOf, updateProject } from '../../domain/projects'
import { presentProjectDetail } from '../../presenters/workspace'

/** Rename or describe a project (engineer, admin), based on `version`: 409 when stale. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, role, user } = await requireProject(event, projectId, 'project.update')
  const body = await validBody(event, ProjectPatchBody)
  const updated = await updateProject(project, user.id, body)
  return presentProjectDetail(updated, await linksOf(updated.id), role, await countLinks(updated.id))
})
