import type { QueryInterface, Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug } from 'umzug'
import { createSequelize } from './connection'
import { migrations } from './migrations'

/** An umzug migrator over the static migration list, recording what ran in `schema_migrations`. */
export function createMigrator(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations,
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
}

/**
 * Applies every pending migration and returns their names. It holds a PostgreSQL advisory lock on
 * its one connection, so app instances starting at once migrate one after another.
 */
export async function migrate(url: string): Promise<string[]> {
  const sequelize = createSequelize(url, 1)
  const lockKey = 7_202_611
  try {
    await sequelize.query('SELECT pg_advisory_lock(:lockKey)', { replacements: { lockKey } })
    const applied = await createMigrator(sequelize).up()
    await sequelize.query('SELECT pg_advisory_unlock(:lockKey)', { replacements: { lockKey } })
    return applied.map(m => m.name)
  }
  finally {
    await sequelize.close()
  }
}
