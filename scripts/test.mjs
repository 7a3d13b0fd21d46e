// `npm test`: packages, PostgreSQL and Chromium as `npm start` has them, then every test on a
// throw-away database that is dropped afterwards.
import { spawn, spawnSync } from 'node:child_process'
import { buildIfStale, dropDatabase, ensureChromium, ensureDatabase, ensurePackages, ensurePostgres, root, serverEnv, setUpDatabase, step } from './lib/setup.mjs'

const started = Date.now()
ensurePackages()
const chromium = ensureChromium()

let cluster = null
let adminUrl
if (process.env.DATABASE_URL) {
  // An external server: make the throw-away database beside the configured one.
  const url = new URL(process.env.DATABASE_URL)
  url.pathname = '/postgres'
  adminUrl = url.toString()
}
else {
  cluster = await ensurePostgres()
  adminUrl = cluster.urlFor('postgres')
}
const testDb = `bloomline_test_${Date.now().toString(36)}_${process.pid}`
await ensureDatabase(adminUrl, testDb)
const databaseUrl = adminUrl.replace(/\/postgres$/, `/${testDb}`)
step(`Throw-away database ${testDb} ready.`)

let code = 1
try {
  setUpDatabase(databaseUrl, { seed: true })
  buildIfStale()
  const port = Number(process.env.BLOOMLINE_TEST_PORT || 3917)
  const env = {
    ...serverEnv({ port, databaseUrl, demoMode: true }),
    BLOOMLINE_TEST_PORT: String(port),
    BLOOMLINE_CHROMIUM: chromium,
    BLOOMLINE_ADMIN_DATABASE_URL: adminUrl,
    // Mail goes to the tests' own SMTP server on loopback (tests/e2e/helpers/smtp.ts); jobs run on
    // one-second intervals, and scheduled runs are fired by the tests, not by the clock.
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(port + 1000),
    SMTP_TLS: 'off',
    MAIL_FROM: 'Bloomline <bloomline@larkspur.example>',
    BLOOMLINE_JOBS_FAST: '1',
    BLOOMLINE_SCHEDULE: 'off',
    NODE_ENV: 'test',
  }
  if (process.env.BLOOMLINE_SKIP_TYPECHECK !== '1') {
    step('Type-checking app, server, shared and tests…')
    const typecheck = spawnSync('npm', ['run', '--silent', 'typecheck'], { cwd: root, stdio: 'inherit' })
    if (typecheck.status !== 0) throw new Error('Type errors: see above.')
  }
  step('Running the tests…')
  const args = ['vitest', 'run', ...process.argv.slice(2)]
  code = await new Promise((resolve) => {
    const child = spawn('npx', args, { cwd: root, env, stdio: 'inherit' })
    child.on('exit', c => resolve(c ?? 1))
  })
}
catch (error) {
  console.error(`\n\x1b[31m✖\x1b[0m ${error.message}\n`)
}
finally {
  await dropDatabase(adminUrl, testDb).catch(error => console.warn(`Could not drop ${testDb}: ${error.message}`))
  if (cluster?.startedHere) cluster.stop()
}
step(`npm test finished in ${Math.round((Date.now() - started) / 1000)} s.`)
process.exit(code)
