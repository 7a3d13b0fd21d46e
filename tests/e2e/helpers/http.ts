import { DEMO_ACCOUNTS } from '../../../seeders/accounts'
import type { Role } from '../../../shared/types/organisation'

export const baseUrl = `http://localhost:${process.env.BLOOMLINE_TEST_PORT}`

/** The cookies a browser would keep for the app. */
export class CookieJar {
  private cookies = new Map<string, string>()

  /** Keeps what a response sets; an expired cookie is removed. */
  take(res: Response) {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';')
      const eq = pair!.indexOf('=')
      const name = pair!.slice(0, eq).trim()
      const value = pair!.slice(eq + 1).trim()
      if (!value || /max-age=0|expires=thu, 01 jan 1970/i.test(line)) this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
  }

  /** The Cookie header to send. */
  header(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }
}

/** A fetch that keeps cookies, like one browser tab. */
export async function request(jar: CookieJar | null, path: string, init: RequestInit & { json?: unknown } = {}) {
  const headers = new Headers(init.headers)
  if (jar) headers.set('cookie', jar.header())
  let body = init.body
  if (init.json !== undefined) {
    headers.set('content-type', 'application/json')
    body = JSON.stringify(init.json)
  }
  const res = await fetch(baseUrl + path, { ...init, headers, body, redirect: 'manual' })
  jar?.take(res)
  return res
}

/** Posts the credentials form exactly as the sign-in page does, through next-auth's real endpoints. */
export async function postCredentials(jar: CookieJar, fields: Record<string, string>) {
  const csrf = await request(jar, '/api/auth/csrf')
  const { csrfToken } = await csrf.json() as { csrfToken: string }
  return request(jar, '/api/auth/callback/credentials', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ ...fields, csrfToken, callbackUrl: `${baseUrl}/`, json: 'true' }).toString(),
  })
}

/** A demo account of a role in the Larkspur demo kennel (or an exact e-mail). */
export function demoAccount(roleOrEmail: Role | string) {
  const account = DEMO_ACCOUNTS.find(a => a.email === roleOrEmail)
    ?? DEMO_ACCOUNTS.find(a => a.memberships[0]?.organisation === 'Larkspur Hollow Kennel' && a.memberships[0]?.role === roleOrEmail)
  if (!account) throw new Error(`No demo account for ${roleOrEmail}`)
  return account
}

/** A cookie jar signed in as a demo account (role or e-mail) or as anyone by e-mail and password; throws if the sign-in fails. */
export async function signedIn(who: Role | string | { email: string, password: string }) {
  const account = typeof who === 'string' ? demoAccount(who) : who
  const jar = new CookieJar()
  const res = await postCredentials(jar, { email: account.email, password: account.password })
  const { url } = await res.json() as { url: string }
  if (res.status !== 200 || new URL(url).searchParams.get('error')) throw new Error(`Sign-in as ${account.email} failed: ${res.status} ${url}`)
  return jar
}
