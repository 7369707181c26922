import { deleteProject } from '../../domain/projects'

/** Delete a project and its links (admin). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { projectId } = await validParams(event, idParams('projectId'))
  const { project, user } = await requireProject(event, projectId, 'project.delete')
  await deleteProject(project, user.id)
  return sendNoContent(event, 204)
})
