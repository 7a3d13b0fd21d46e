import bcrypt from 'bcryptjs'
import { getSequelize } from '../../../server/database/connection'
import { initModels } from '../../../server/database/models'
import { DEMO_ACCOUNTS, DEMO_ORGANISATIONS } from '../../../seeders/accounts'
import { seedKennel } from '../../../seeders/kennel'

// The weekly status is one message per person and ISO week, so a test that sends it cannot share
// the demo kennel with another test (or with a cron tick) that may already have sent this week's.
// A copy of the invented demo (seeders/), with its own organisations and people, gives each test
// a week nobody has been sent yet, and the same dogs, handlers, entries and tasks as the demo.

/** One person of a copy: the demo account's role and password, under an address of its own. */
export interface ClonePerson {
  userId: number
  name: string
  email: string
  password: string
  demoEmail: string
}

/** A copy of the demo: its kennel (a copy of Larkspur Hollow) and club, and its people by demo address. */
export interface DemoClone {
  tag: string
  kennelId: number
  clubId: number
  kennelName: string
  clubName: string
  people: Map<string, ClonePerson>
  /** The copy of a demo person, by their demo address or their role in the kennel. */
  person(demoEmailOrRole: string): ClonePerson
}

/**
 * Copies the demo kennel and club with new people (addresses tagged with `tag`), in one
 * transaction. Their weekly status is due from Monday 00:00, so a run finds it due on any day.
 */
export async function cloneDemo(tag: string, options: { toAssistants?: boolean } = {}): Promise<DemoClone> {
  const sequelize = getSequelize()
  const { Organisation, User, Membership } = initModels(sequelize)
  const organisations = new Map<string, number>()
  const users = new Map<string, number>()
  const people = new Map<string, ClonePerson>()
  await sequelize.transaction(async (transaction) => {
    for (const o of DEMO_ORGANISATIONS) {
      const row = await Organisation.create({ ...o, name: `${o.name} (${tag})`, weeklyDay: 1, weeklyHour: 0, weeklyToAssistants: options.toAssistants ?? false }, { transaction })
      organisations.set(o.name, row.id)
    }
    for (const account of DEMO_ACCOUNTS) {
      const [local, domain] = account.email.split('@') as [string, string]
      const email = `${local}+${tag}@${domain}`
      // A low bcrypt cost: these accounts live for one test run.
      const user = await User.create({
        name: account.name,
        email,
        passwordHash: await bcrypt.hash(account.password, 4),
        lastOrganisationId: organisations.get(account.memberships[0]!.organisation)!,
      }, { transaction })
      users.set(account.email, user.id)
      people.set(account.email, { userId: user.id, name: account.name, email, password: account.password, demoEmail: account.email })
      for (const m of account.memberships) {
        await Membership.create({ userId: user.id, organisationId: organisations.get(m.organisation)!, role: m.role }, { transaction })
      }
    }
    await seedKennel(sequelize, transaction, { organisations, users })
  })
  const kennel = DEMO_ORGANISATIONS[0]!.name
  return {
    tag,
    kennelId: organisations.get(kennel)!,
    clubId: organisations.get(DEMO_ORGANISATIONS[1]!.name)!,
    kennelName: `${kennel} (${tag})`,
    clubName: `${DEMO_ORGANISATIONS[1]!.name} (${tag})`,
    people,
    person(demoEmailOrRole: string) {
      const account = DEMO_ACCOUNTS.find(a => a.email === demoEmailOrRole)
        ?? DEMO_ACCOUNTS.find(a => a.memberships[0]?.organisation === kennel && a.memberships[0]?.role === demoEmailOrRole)
      const found = account && people.get(account.email)
      if (!found) throw new Error(`No person ${demoEmailOrRole} in the copy ${tag}`)
      return found
    },
  }
}

/** Turns the weekly status off for every organisation but `keep`, so a cron tick in a test sends nothing to them; returns the ids it turned off. */
export async function weeklyOnlyFor(keep: number[]): Promise<number[]> {
  const [rows] = await getSequelize().query(
    'UPDATE organisations SET weekly_enabled = false WHERE weekly_enabled AND NOT (id = ANY($1::int[])) RETURNING id',
    { bind: [keep] },
  ) as [{ id: number }[], unknown]
  return rows.map(r => r.id)
}

/** Turns the weekly status back on for organisations `weeklyOnlyFor` turned off. */
export async function weeklyBackOn(ids: number[]): Promise<void> {
  if (ids.length) await getSequelize().query('UPDATE organisations SET weekly_enabled = true WHERE id = ANY($1::int[])', { bind: [ids] })
}
