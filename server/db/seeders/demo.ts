/**
 * The demo scenario of product.md (invented): team "Harrow Bay Drives", a small maker
 * of solar pump inverters, with one user per role, the project "PX-7 pump inverter"
 * with its three links, and the built-in part library. Runs only on an empty database
 * (the built-in parts are added whenever missing). Demo passwords are documented in README.md.
 */
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import type { Sequelize, Transaction } from 'sequelize'
import { LinkSpec, StageSpec } from '../../../shared/schemas/link'
import type { Role } from '../../../shared/schemas/roles'
import { analyzeAndSummarize } from '../../domain/analysis'
import { AuditEntry, Link, Membership, Part, Project, Team, User } from '../models'
import { BUILT_IN_PARTS, DEMO_PROJECT } from './demo-links'

/** One password for every demo account (README.md, "Demo accounts"). */
export const DEMO_PASSWORD = 'harrow-bay-demo'

export const DEMO_USERS: { name: string; email: string; role: Role }[] = [
  { name: 'Iris Calder', email: 'admin@harrowbay.example', role: 'admin' },
  { name: 'Tomas Wren', email: 'firmware@harrowbay.example', role: 'engineer' },
  { name: 'Nadia Okoro', email: 'hardware@harrowbay.example', role: 'engineer' },
  { name: 'Rafael Lindqvist', email: 'reviewer@harrowbay.example', role: 'reviewer' },
  { name: 'June Achterberg', email: 'viewer@harrowbay.example', role: 'viewer' },
]

/** Same scrypt settings as nuxt-auth-utils' hashPassword (its defaults). */
export function hashDemoPassword(password: string) {
  return new Hash(new Scrypt({})).make(password)
}

/**
 * Insert the built-in parts that are missing (by name) and bring the existing ones up to
 * the library's current class values (built-ins are read-only to teams: the library owns
 * them); each stage is validated with StageSpec. Returns how many were added or updated.
 */
export async function seedBuiltInParts(transaction?: Transaction): Promise<number> {
  let changed = 0
  for (const p of BUILT_IN_PARTS) {
    const stage = StageSpec.parse(p.stage)
    const category = p.category as Part['category']
    const existing = await Part.findOne({ where: { teamId: null, name: p.name }, transaction })
    if (!existing) {
      await Part.create({ teamId: null, name: p.name, category, description: p.description, stage, createdBy: null, updatedBy: null }, { transaction })
      changed++
    } else if (JSON.stringify(existing.stage) !== JSON.stringify(stage) || existing.description !== p.description || existing.category !== category) {
      await existing.update({ stage, description: p.description, category }, { transaction })
      changed++
    }
  }
  return changed
}

export async function seedDemo(sequelize: Sequelize): Promise<boolean> {
  if ((await User.count()) > 0) {
    await seedBuiltInParts()
    return false
  }
  await sequelize.transaction(async (transaction) => {
    await seedBuiltInParts(transaction)
    const team = await Team.create({ name: 'Harrow Bay Drives' }, { transaction })
    const passwordHash = await hashDemoPassword(DEMO_PASSWORD)
    const users: Record<string, User> = {}
    for (const u of DEMO_USERS) {
      const user = await User.create({ name: u.name, email: u.email, passwordHash }, { transaction })
      await Membership.create({ userId: user.id, teamId: team.id, role: u.role }, { transaction })
      users[u.email] = user
    }
    const author = users['hardware@harrowbay.example']!
    const project = await Project.create(
      { teamId: team.id, name: DEMO_PROJECT.name, description: DEMO_PROJECT.description, createdBy: author.id, updatedBy: author.id },
      { transaction },
    )
    await AuditEntry.create({ teamId: team.id, userId: author.id, action: 'project.create', entity: 'project', entityId: project.id, detail: { name: project.name, seed: true } }, { transaction })
    for (const input of DEMO_PROJECT.links) {
      const spec = LinkSpec.parse(input)
      const summary = analyzeAndSummarize(spec)
      const link = await Link.create(
        { projectId: project.id, teamId: team.id, name: spec.name, protocol: spec.protocol, spec, summary, createdBy: author.id, updatedBy: author.id },
        { transaction },
      )
      await AuditEntry.create({ teamId: team.id, userId: author.id, action: 'link.create', entity: 'link', entityId: link.id, detail: { projectId: project.id, name: spec.name, verdict: summary.verdict, seed: true } }, { transaction })
    }
  })
  return true
}
