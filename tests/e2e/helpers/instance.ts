import { spawn, type ChildProcess } from 'node:child_process'
import { join } from 'node:path'
import type { Role } from '../../../shared/types/organisation'
import { CookieJar, demoAccount } from './http'

const entry = join(import.meta.dirname, '..', '..', '..', '.output', 'server', 'index.mjs')

/** Another instance of the built app on `port`, against the test database, with `env` on top of the tests' own. */
export async function startInstance(port: number, env: Record<string, string | undefined> = {}) {
  const merged: Record<string, string | undefined> = { ...process.env, PORT: String(port), NITRO_PORT: String(port), NODE_ENV: 'production', ...env }
  for (const key of Object.keys(merged)) if (merged[key] === undefined) delete merged[key]
  let output = ''
  const child: ChildProcess = spawn(process.execPath, [entry], { env: merged as NodeJS.ProcessEnv, stdio: ['ignore', 'pipe', 'pipe'] })
  child.stdout!.on('data', (d: Buffer) => { output += d.toString() })
  child.stderr!.on('data', (d: Buffer) => { output += d.toString() })
  const deadline = Date.now() + 30_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The instance on ${port} exited: ${output}`)
    const res = await fetch(`http://127.0.0.1:${port}/api/health`).catch(() => undefined)
    if (res?.ok) break
    if (Date.now() > deadline) throw new Error(`The instance on ${port} did not answer in 30 s: ${output}`)
    await new Promise(r => setTimeout(r, 100))
  }
  return {
    url: `http://127.0.0.1:${port}`,
    output: () => output,
    /** Stops it: SIGTERM lets it finish, SIGKILL is a crash. */
    async stop(signal: NodeJS.Signals = 'SIGTERM') {
      if (child.exitCode !== null || child.signalCode) return
      const exited = new Promise(r => child.once('exit', r))
      child.kill(signal)
      const timedOut = await Promise.race([exited.then(() => false), new Promise(r => setTimeout(r, 8000, true))])
      if (timedOut) {
        child.kill('SIGKILL')
        await exited
      }
    },
  }
}

/** A cookie jar signed in on another instance through its own next-auth endpoints, as a demo account (role or e-mail) or as anyone by e-mail and password; throws if the sign-in fails. */
export async function signedInAt(url: string, who: Role | string | { email: string, password: string }) {
  const account = typeof who === 'string' ? demoAccount(who) : who
  const jar = new CookieJar()
  const csrf = await fetch(`${url}/api/auth/csrf`)
  jar.take(csrf)
  const { csrfToken } = await csrf.json() as { csrfToken: string }
  const res = await fetch(`${url}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', 'cookie': jar.header() },
    body: new URLSearchParams({ email: account.email, password: account.password, csrfToken, callbackUrl: `${url}/`, json: 'true' }).toString(),
  })
  jar.take(res)
  if (res.status !== 200) throw new Error(`Sign-in as ${account.email} at ${url} failed: ${res.status}`)
  return jar
}
