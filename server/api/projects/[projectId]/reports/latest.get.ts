import { latestRevisions } from '../../../../domain/reports'
import { presentLatest } from '../../../../presenters/report'

/** Each link's newest revision and its state, for the project page (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  await requireProject(event, projectId, 'report.read')
  return (await latestRevisions(projectId)).map(presentLatest)
})
