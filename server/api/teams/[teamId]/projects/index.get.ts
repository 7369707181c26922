import { listProjects } from '../../../../domain/projects'
import { presentProject } from '../../../../presenters/workspace'

/** The team's projects (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'project.read')
  return (await listProjects(teamId)).map((p) => presentProject(p.project, p.linkCount))
})
