import { spawn, type ChildProcess } from 'node:child_process'
import { existsSync } from 'node:fs'
import { join } from 'node:path'

const root = join(import.meta.dirname, '..', '..', '..')
let server: ChildProcess | undefined

/** Starts the built app once for every API and browser test file, on the port `npm test` chose. */
export async function setup() {
  const port = process.env.BLOOMLINE_TEST_PORT
  if (!port || !process.env.DATABASE_URL) throw new Error('Run the end-to-end tests through `npm test`, which prepares the database and the build.')
  const entry = join(root, '.output', 'server', 'index.mjs')
  if (!existsSync(entry)) throw new Error('No build in .output: run `npm test`, which builds when needed.')
  server = spawn(process.execPath, [entry], { env: { ...process.env, NODE_ENV: 'production' }, stdio: ['ignore', 'inherit', 'inherit'] })
  const deadline = Date.now() + 30_000
  while (Date.now() < deadline) {
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`)
      if (res.ok) return
    }
    catch {}
    await new Promise(r => setTimeout(r, 200))
  }
  throw new Error(`The app did not answer on port ${port} within 30 s.`)
}

/** Stops the app. */
export async function teardown() {
  if (!server || server.exitCode !== null) return
  const exited = new Promise(r => server!.once('exit', r))
  server.kill('SIGTERM')
  await Promise.race([exited, new Promise(r => setTimeout(r, 5000))])
}
