import { countLinks, linksOf } from '../../domain/projects'
import { presentProjectDetail } from '../../presenters/workspace'

/** A project with its links as summaries (verdict, worst margin, max rate cached at save time). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, role } = await requireProject(event, projectId, 'project.read')
  return presentProjectDetail(project, await linksOf(project.id), role, await countLinks(project.id))
})
