/**
 * The demo scenario of product.md (invented): team "Harrow Bay Drives", a small maker
 * of solar pump inverters, with one user per role. Runs only on an empty database.
 * Demo passwords are documented in README.md.
 */
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import type { Sequelize } from 'sequelize'
import { Membership, Team, User } from '../models'
import type { Role } from '../../../shared/schemas/roles'

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

export async function seedDemo(sequelize: Sequelize): Promise<boolean> {
  if ((await User.count()) > 0) return false
  await sequelize.transaction(async (transaction) => {
    const team = await Team.create({ name: 'Harrow Bay Drives' }, { transaction })
    const passwordHash = await hashDemoPassword(DEMO_PASSWORD)
    for (const u of DEMO_USERS) {
      const user = await User.create({ name: u.name, email: u.email, passwordHash }, { transaction })
      await Membership.create({ userId: user.id, teamId: team.id, role: u.role }, { transaction })
    }
  })
  return true
}
