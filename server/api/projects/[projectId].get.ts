import { countLinks, linksOf } from '../../domain/projects'
import { signOffsOf } from '../../domain/sign-offs'
import { presentProjectDetail } from '../../presenters/workspace'

/** A project with its links as summaries (verdict, worst margin, max rate cached at save time; the latest sign-off and whether the link changed since). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, role } = await requireProject(event, projectId, 'project.read')
  const links = await linksOf(project.id)
  return presentProjectDetail(project, links, role, await countLinks(project.id), await signOffsOf(links))
})
