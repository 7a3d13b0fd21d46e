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
    database = { ok: false, error: error instanceof Error ? error.message.split('\n')[0] : 'unreachable' }
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
