import bcrypt from 'bcryptjs'
import type { Sequelize } from 'sequelize'
import { initModels } from '../server/database/models'
import { DEMO_ACCOUNTS, DEMO_ORGANISATIONS } from './accounts'
import { seedKennel } from './kennel'

/** True when the database holds no organisation yet. */
export async function isEmpty(sequelize: Sequelize): Promise<boolean> {
  const { Organisation } = initModels(sequelize)
  return (await Organisation.count()) === 0
}

/** Loads the invented demo kennel, club and people, then their dogs, coat work, shows and tasks, in one transaction. */
export async function seedDemo(sequelize: Sequelize): Promise<void> {
  const { Organisation, User, Membership } = initModels(sequelize)
  await sequelize.transaction(async (transaction) => {
    const organisations = new Map<string, number>()
    const users = new Map<string, number>()
    for (const o of DEMO_ORGANISATIONS) {
      const row = await Organisation.create(o, { transaction })
      organisations.set(o.name, row.id)
    }
    for (const account of DEMO_ACCOUNTS) {
      const user = await User.create({
        name: account.name,
        email: account.email,
        passwordHash: await bcrypt.hash(account.password, 10),
        lastOrganisationId: organisations.get(account.memberships[0]!.organisation)!,
      }, { transaction })
      users.set(account.email, user.id)
      for (const m of account.memberships) {
        await Membership.create({ userId: user.id, organisationId: organisations.get(m.organisation)!, role: m.role }, { transaction })
      }
    }
    await seedKennel(sequelize, transaction, { organisations, users })
  })
}
