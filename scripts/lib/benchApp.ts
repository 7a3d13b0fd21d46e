// What the benches that serve the built app share (scripts/bench-grid.ts, scripts/bench-import.ts):
// the setup of `npm start` with its shape, a free port, the app started and stopped, a sign-in,
// and the figures they print.
import { spawn, type ChildProcess } from 'node:child_process'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { signedInAt } from '../../tests/e2e/helpers/instance'

interface Cluster { urlFor: (name: string) => string, startedHere: boolean, stop: () => void }
interface SetupModule {
  root: string
  step: (text: string) => void
  ensurePostgres: () => Promise<Cluster>
  ensureDatabase: (adminUrl: string, name: string) => Promise<void>
  dropDatabase: (adminUrl: string, name: string) => Promise<void>
  setUpDatabase: (databaseUrl: string, options: { seed: boolean }) => void
  buildIfStale: () => boolean
  ensureChromium: () => string
  serverEnv: (options: { port: number, databaseUrl: string, demoMode: boolean }) => NodeJS.ProcessEnv
  portIsFree: (port: number) => Promise<boolean>
}

// setup.mjs is plain Node with no type declarations (it runs before node_modules exists), so it
// is loaded by URL and given its shape here.
const here = dirname(fileURLToPath(import.meta.url))
/** scripts/lib/setup.mjs, typed: the private PostgreSQL cluster, databases, the build, Chromium, the server's environment and a port check. */
export const setup = await import(pathToFileURL(join(here, 'setup.mjs')).href) as SetupModule

/** What a bench gets from `onThrowawayDatabase`: its database, and a way to close what it opens before the database is dropped. */
export interface BenchDatabase { name: string, databaseUrl: string, onEnd: (close: () => Promise<unknown>) => void }

/** Runs `bench` on a new, migrated database in the private cluster, then closes what it opened, drops the database and stops the cluster if it started it; an error is printed and gives exit code 1. */
export async function onThrowawayDatabase(prefix: string, bench: (database: BenchDatabase) => Promise<number>): Promise<number> {
  const cluster = await setup.ensurePostgres()
  const adminUrl = cluster.urlFor('postgres')
  const name = `${prefix}_${Date.now().toString(36)}_${process.pid}`
  const databaseUrl = cluster.urlFor(name)
  const closers: (() => Promise<unknown>)[] = []
  let code = 0
  try {
    await setup.ensureDatabase(adminUrl, name)
    setup.setUpDatabase(databaseUrl, { seed: false })
    // Last opened, first closed.
    code = await bench({ name, databaseUrl, onEnd: close => closers.unshift(close) })
  }
  catch (error) {
    console.error(`\n\x1b[31m✖\x1b[0m ${(error as Error).message}\n`)
    code = 1
  }
  finally {
    for (const close of closers) await close()
    await setup.dropDatabase(adminUrl, name).catch(error => console.warn(`Could not drop ${name}: ${(error as Error).message}`))
    if (cluster.startedHere) cluster.stop()
  }
  return code
}

/** The first port from `from` on (50 tried) that nothing listens on at 127.0.0.1. */
export async function freePort(from: number): Promise<number> {
  for (let port = from; port < from + 50; port++) if (await setup.portIsFree(port)) return port
  throw new Error(`No free port between ${from} and ${from + 49}`)
}

/** Serves the built app (.output) on `port` against `databaseUrl` and waits for /api/health; `cpuProfileDir` writes the server's CPU profile there when it stops. */
export async function startApp(port: number, databaseUrl: string, options: { cpuProfileDir?: string } = {}): Promise<ChildProcess> {
  const entry = join(setup.root, '.output', 'server', 'index.mjs')
  const profile = options.cpuProfileDir ? ['--cpu-prof', `--cpu-prof-dir=${options.cpuProfileDir}`] : []
  const child = spawn(process.execPath, [...profile, entry], { env: { ...setup.serverEnv({ port, databaseUrl, demoMode: false }), NODE_ENV: 'production' }, stdio: ['ignore', 'ignore', 'inherit'] })
  const deadline = Date.now() + 30_000
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The app exited (code ${child.exitCode}) before it answered`)
    try {
      if ((await fetch(`http://127.0.0.1:${port}/api/health`)).ok) return child
    }
    catch {}
    await new Promise(r => setTimeout(r, 200))
  }
  throw new Error(`The app did not answer on port ${port} within 30 s`)
}

/** Stops the app with SIGTERM, waiting at most 5 s for it to exit (so a CPU profile gets written). */
export async function stopApp(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return
  const exited = new Promise(r => child.once('exit', r))
  child.kill('SIGTERM')
  await Promise.race([exited, new Promise(r => setTimeout(r, 5000))])
}

/** The Cookie header of a session signed in at `baseUrl` through next-auth's real endpoints, as the tests sign in. */
export async function signedInCookie(baseUrl: string, who: { email: string, password: string }): Promise<string> {
  return (await signedInAt(baseUrl, who)).header()
}

/** The value at quantile `q` of `values`, the nearest rank (no interpolation). */
export function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)]!
}

/** The median by nearest rank: the middle value, or the lower of the two middle ones. */
export const median = (values: number[]) => quantile(values, 0.5)

/** A duration as the benches print it, `12.3 ms`. */
export const ms = (value: number) => `${value.toFixed(1)} ms`
