import { countLinks, linksOf } from '../../../../domain/projects'
import { signOffsOf } from '../../../../domain/sign-offs'
import { presentLinkSummary } from '../../../../presenters/workspace'

/** One page of the project's links as summaries, by name. ?limit=200&offset=0 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project } = await requireProject(event, projectId, 'link.read')
  const page = await validPage(event, ...PAGE_SIZES.links)
  const [links, count] = await Promise.all([linksOf(project.id, page), countLinks(project.id)])
  const signOffs = await signOffsOf(links)
  return sendPage(event, links.map((l) => presentLinkSummary(l, signOffs.get(l.id) ?? null)), count, page)
})
