/** Projects of a team. Updates name the version they were based on (optimistic locking). */
import { fn, col } from 'sequelize'
import type { ProjectCreateBody, ProjectPatchBody } from '../../shared/schemas/project'
import { Link, Project } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError } from '../utils/errors'
import { PAGE_SIZES, type Page } from '../utils/paging'
import { presentProject } from '../presenters/workspace'
import { audit } from './audit'

/** The team's projects with their link counts. */
export async function listProjects(teamId: number) {
  const projects = await Project.findAll({ where: { teamId }, order: [['name', 'ASC'], ['id', 'ASC']] })
  const counts = (await Link.findAll({
    where: { teamId },
    attributes: ['projectId', [fn('COUNT', col('id')), 'n']],
    group: ['projectId'],
    raw: true,
  })) as unknown as { projectId: number; n: string }[]
  const byProject = new Map(counts.map((c) => [c.projectId, Number(c.n)]))
  return projects.map((p) => ({ project: p, linkCount: byProject.get(p.id) ?? 0 }))
}

/** One page of the project's links by name (the first page unless asked). */
export function linksOf(projectId: number, page: Page = { limit: PAGE_SIZES.links[0], offset: 0 }) {
  return Link.findAll({ where: { projectId }, order: [['name', 'ASC'], ['id', 'ASC']], limit: page.limit, offset: page.offset })
}

export function countLinks(projectId: number) {
  return Link.count({ where: { projectId } })
}

export async function createProject(teamId: number, userId: number, body: ProjectCreateBody) {
  return useDb().transaction(async (transaction) => {
    const project = await Project.create({ teamId, name: body.name, description: body.description, createdBy: userId, updatedBy: userId }, { transaction })
    await audit(transaction, { teamId, userId, action: 'project.create', entity: 'project', entityId: project.id, detail: { name: project.name } })
    return project
  })
}

export async function updateProject(project: Project, userId: number, body: ProjectPatchBody) {
  return useDb().transaction(async (transaction) => {
    const changes = {
      ...(body.name !== undefined ? { name: body.name } : {}),
      ...(body.description !== undefined ? { description: body.description } : {}),
    }
    const [n] = await Project.update(
      { ...changes, version: body.version + 1, updatedBy: userId },
      { where: { id: project.id, version: body.version }, transaction },
    )
    const current = await Project.findByPk(project.id, { transaction, rejectOnEmpty: true })
    if (n === 0) {
      const linkCount = await Link.count({ where: { projectId: project.id }, transaction })
      throw new ConflictError('the project was changed by someone else; reload it and apply your edit again', {
        currentVersion: current.version,
        project: presentProject(current, linkCount),
      })
    }
    await audit(transaction, { teamId: project.teamId, userId, action: 'project.update', entity: 'project', entityId: project.id, detail: { fromVersion: body.version, toVersion: current.version, fields: Object.keys(changes) } })
    return current
  })
}

export async function deleteProject(project: Project, userId: number) {
  await useDb().transaction(async (transaction) => {
    await audit(transaction, { teamId: project.teamId, userId, action: 'project.delete', entity: 'project', entityId: project.id, detail: { name: project.name } })
    await project.destroy({ transaction })
  })
}
