/** The app's and the database's state, for load balancers and people. Open without a session. */
export default defineEventHandler(async (event) => {
  const started = Date.now()
  let database: { ok: boolean, latencyMs?: number, migrations?: number, error?: string }
  try {
    const { sequelize } = useModels()
    const [rows] = await sequelize.query('SELECT count(*)::int AS n FROM schema_migrations')
    database = { ok: true, latencyMs: Date.now() - started, migrations: (rows as { n: number }[])[0]?.n ?? 0 }
  }
  catch (error) {
    // The reason goes to the server log only: this route answers without a session.
    console.error('[health] database check failed:', error instanceof Error ? error.message : error)
    database = { ok: false, error: 'The database did not answer.' }
  }
  if (!database.ok) setResponseStatus(event, 503)
  return {
    app: 'bloomline',
    version: useRuntimeConfig().public.version,
    status: database.ok ? 'ok' : 'degraded',
    uptimeSeconds: Math.round(process.uptime()),
    database,
  }
})
