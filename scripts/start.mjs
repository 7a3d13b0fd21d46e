// `npm start` (and `npm run dev` with --dev): packages, PostgreSQL, migrations, demo data, build, serve.
import { join } from 'node:path'
import { buildIfStale, ensureDatabase, ensurePackages, ensurePostgres, fail, root, serverEnv, setUpDatabase, spawnChild, step } from './lib/setup.mjs'

const dev = process.argv.includes('--dev')
const port = Number(process.env.PORT || 3000)
const started = Date.now()

ensurePackages()

let cluster = null
let databaseUrl = process.env.DATABASE_URL
if (databaseUrl) {
  step('Using the PostgreSQL in DATABASE_URL (no private cluster).')
}
else {
  cluster = await ensurePostgres()
  await ensureDatabase(cluster.urlFor('postgres'), 'bloomline')
  databaseUrl = cluster.urlFor('bloomline')
}

step('Preparing the database…')
setUpDatabase(databaseUrl, { seed: !process.env.DATABASE_URL || process.env.BLOOMLINE_SEED_DEMO === 'true' })

const demoMode = !process.env.DATABASE_URL
const env = serverEnv({ port, databaseUrl, demoMode })
let server
if (dev) {
  server = spawnChild('npx', ['nuxt', 'dev', '--port', String(port)], env)
}
else {
  buildIfStale()
  server = spawnChild(process.execPath, [join(root, '.output', 'server', 'index.mjs')], env)
}

await waitForHealth(port)
const { tsImport } = await import('tsx/esm/api')
const { DEMO_ACCOUNTS } = await tsImport('../seeders/accounts.ts', import.meta.url)
console.log(`\n  \x1b[1mBloomline is serving on http://localhost:${port}\x1b[0m  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)\n`)
if (demoMode) {
  console.log('  Demo sign-ins (invented people; every password is printed here on purpose):')
  for (const a of DEMO_ACCOUNTS) {
    const roles = a.memberships.map(m => `${m.role} at ${m.organisation}`).join('; ')
    console.log(`    ${a.email.padEnd(26)} ${a.password.padEnd(20)} ${a.name}: ${roles}`)
  }
}
if (process.env.SMTP_HOST) console.log(`\n  Mail goes out through ${process.env.SMTP_HOST}:${process.env.SMTP_PORT || 587} as ${process.env.MAIL_FROM || 'Bloomline <bloomline@localhost>'}.`)
else if (demoMode) console.log(`\n  Mail: no SMTP_HOST is set, so the app runs its own SMTP server on loopback and keeps every message.\n  Read them at http://localhost:${port}/mailbox (sign in as a manager).`)
else console.log('\n  Mail: no SMTP_HOST is set; messages wait in the outbox until one is configured.')
console.log('\n  Ctrl-C stops the server' + (cluster?.startedHere ? ' and the database.' : '.') + '\n')

let stopping = false
function shutdown() {
  if (stopping) return
  stopping = true
  step('Stopping…')
  server.kill('SIGTERM')
}
process.on('SIGINT', shutdown)
process.on('SIGTERM', shutdown)
server.on('exit', (code) => {
  if (cluster?.startedHere) cluster.stop()
  process.exit(stopping ? 0 : (code ?? 1))
})

async function waitForHealth(p) {
  const deadline = Date.now() + (dev ? 120_000 : 30_000)
  while (Date.now() < deadline) {
    if (server.exitCode !== null) fail('The server stopped during start-up; its messages are above.')
    try {
      const res = await fetch(`http://127.0.0.1:${p}/api/health`)
      if (res.ok) return
    }
    catch {}
    await new Promise(r => setTimeout(r, 250))
  }
  fail(`The server did not answer on port ${p} in time.`)
}
