import { linksOf } from '../../../../domain/projects'
import { presentLinkSummary } from '../../../../presenters/workspace'

/** The project's links as summaries. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project } = await requireProject(event, projectId, 'link.read')
  return (await linksOf(project.id)).map(presentLinkSummary)
})
