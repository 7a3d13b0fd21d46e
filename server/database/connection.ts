import { AsyncLocalStorage } from 'node:async_hooks'
import pg from 'pg'
import { Sequelize } from 'sequelize'

let instance: Sequelize | undefined

// Every query started inside `sequelize.transaction(async () => …)` joins that transaction, even
// when a helper deep down does not pass it on. Without this, such a query waits for a second pooled
// connection while the transaction holds the first, and enough parallel requests exhaust the pool.
// Sequelize 6 takes any namespace with run/get/set/bind (it was written for cls-hooked); this one
// is Node's own AsyncLocalStorage.
const contexts = new AsyncLocalStorage<Map<string, unknown>>()
Sequelize.useCLS({
  run(fn: (context: Map<string, unknown>) => unknown) {
    const context = new Map(contexts.getStore())
    return contexts.run(context, () => fn(context))
  },
  get: (key: string) => contexts.getStore()?.get(key),
  set: (key: string, value: unknown) => {
    contexts.getStore()?.set(key, value)
    return value
  },
  bind: <F>(fn: F) => fn,
} as unknown as Parameters<typeof Sequelize.useCLS>[0])

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
