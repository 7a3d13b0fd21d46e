import pg from 'pg'
import { Sequelize } from 'sequelize'

let instance: Sequelize | undefined

/** A new Sequelize instance for a PostgreSQL URL. */
export function createSequelize(url: string, poolMax = Number(process.env.BLOOMLINE_DB_POOL ?? 10)): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    // Nitro bundles the server, so hand Sequelize the driver instead of letting it require one by name.
    dialectModule: pg,
    logging: false,
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 30_000 },
    define: { underscored: true },
  })
}

/** The one Sequelize instance of this process, built from DATABASE_URL on first use. */
export function getSequelize(url = process.env.DATABASE_URL): Sequelize {
  if (instance) return instance
  if (!url) throw new Error('DATABASE_URL is not set: run `npm start`, or set it to a PostgreSQL URL.')
  instance = createSequelize(url)
  return instance
}

/** Closes the pool, so a script or a test can exit. */
export async function closeSequelize(): Promise<void> {
  if (!instance) return
  const closing = instance
  instance = undefined
  await closing.close()
}
