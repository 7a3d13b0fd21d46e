import { spawn } from 'node:child_process'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { SIGN_IN_FAILED } from '../../../shared/auth'
import type { MemberView, MeView } from '../../../shared/types/organisation'
import { CookieJar, demoAccount, postCredentials, request, signedIn } from '../helpers/http'

const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
beforeAll(() => db.connect())
afterAll(() => db.end())

describe('health', () => {
  it('answers without a session and reports the database', async () => {
    const res = await request(null, '/api/health')
    expect(res.status).toBe(200)
    const body = await res.json()
    expect(body).toMatchObject({ app: 'bloomline', status: 'ok', database: { ok: true } })
    expect(body.database.migrations).toBeGreaterThan(0)
  })
})

describe('without a session', () => {
  it.each(['/api/me', '/api/members', '/api/members/1', '/api/organisation', '/api/organisations', '/api/no-such-route'])('GET %s is 401', async (path) => {
    const res = await request(null, path)
    expect(res.status).toBe(401)
  })

  it('a forged session cookie is 401', async () => {
    const res = await request(null, '/api/me', { headers: { cookie: 'next-auth.session-token=forged.token.value' } })
    expect(res.status).toBe(401)
  })
})

describe('signing in as each role', () => {
  it.each([
    ['manager', 'manager'],
    ['handler', 'handler'],
    ['assistant', 'assistant'],
  ] as const)('%s gets a session that carries the user, the organisation and the role', async (role, expected) => {
    const jar = await signedIn(role)
    const me = await (await request(jar, '/api/me')).json() as MeView
    expect(me.user.email).toBe(demoAccount(role).email)
    expect(me.organisation?.name).toBe('Larkspur Hollow Kennel')
    expect(me.role).toBe(expected)

    const session = await (await request(jar, '/api/auth/session')).json()
    expect(session).toMatchObject({ role: expected, organisation: { name: 'Larkspur Hollow Kennel' } })
  })

  it('signing out ends the session', async () => {
    const jar = await signedIn('handler')
    const { csrfToken } = await (await request(jar, '/api/auth/csrf')).json() as { csrfToken: string }
    await request(jar, '/api/auth/signout', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, json: 'true' }).toString(),
    })
    expect((await request(jar, '/api/me')).status).toBe(401)
  })
})

describe('wrong credentials', () => {
  // OWASP Authentication Cheat Sheet, "Authentication and Error Messages": the same answer for an
  // unknown account and a wrong password, so the response does not reveal which accounts exist.
  it('a wrong e-mail and a wrong password get the same answer', async () => {
    const wrongPassword = await postCredentials(new CookieJar(), { email: demoAccount('handler').email, password: 'not-the-password' })
    const wrongEmail = await postCredentials(new CookieJar(), { email: 'nobody-here@larkspur.example', password: 'not-the-password' })
    expect(wrongPassword.status).toBe(wrongEmail.status)
    const [a, b] = [await wrongPassword.json(), await wrongEmail.json()]
    expect(a).toEqual(b)
    expect(new URL(a.url).searchParams.get('error')).toBe('CredentialsSignin')
    expect(SIGN_IN_FAILED).not.toMatch(/password is wrong|no account|unknown/i)
  })

  it('a missing field is a 400 that names it', async () => {
    const res = await postCredentials(new CookieJar(), { email: 'tobias@larkspur.example' })
    expect(res.status).toBe(400)
    expect((await res.json()).message).toMatch(/password/)
  })
})

describe('lock-out after repeated failures', () => {
  const account = demoAccount('juno@larkspur.example')

  it('the 11th try within 15 minutes gets 429, even with the right password, on every app instance', async () => {
    for (let i = 1; i <= 10; i++) {
      const res = await postCredentials(new CookieJar(), { email: account.email.toUpperCase(), password: `wrong-${i}` })
      expect(res.status, `failure ${i}`).toBe(401)
    }
    const locked = await postCredentials(new CookieJar(), { email: account.email, password: account.password })
    expect(locked.status).toBe(429)
    expect(Number(locked.headers.get('retry-after'))).toBeGreaterThan(14 * 60)
    expect((await locked.json()).message).toMatch(/Too many failed sign-ins.*15 minutes/)

    // The count lives in PostgreSQL: a second app instance on the same database refuses too.
    const { rows } = await db.query('SELECT locked_until FROM sign_in_locks WHERE email = $1', [account.email])
    expect(rows).toHaveLength(1)
    const secondPort = Number(process.env.BLOOMLINE_TEST_PORT) + 1
    const second = spawn(process.execPath, [join(import.meta.dirname, '..', '..', '..', '.output', 'server', 'index.mjs')], {
      env: { ...process.env, PORT: String(secondPort), NITRO_PORT: String(secondPort), NODE_ENV: 'production' },
      stdio: 'ignore',
    })
    try {
      let res: Response | undefined
      for (let i = 0; i < 100 && !res; i++) {
        res = await fetch(`http://127.0.0.1:${secondPort}/api/health`).catch(() => undefined)
        if (!res) await new Promise(r => setTimeout(r, 100))
      }
      const csrf = await fetch(`http://127.0.0.1:${secondPort}/api/auth/csrf`)
      const { csrfToken } = await csrf.json() as { csrfToken: string }
      const cookie = csrf.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
      const there = await fetch(`http://127.0.0.1:${secondPort}/api/auth/callback/credentials`, {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded', cookie },
        body: new URLSearchParams({ email: account.email, password: account.password, csrfToken, json: 'true' }).toString(),
      })
      expect(there.status).toBe(429)
    }
    finally {
      second.kill('SIGTERM')
    }
  })

  it('the lock lifts after 15 minutes', async () => {
    await db.query(`UPDATE sign_in_locks SET locked_until = now() - interval '1 second' WHERE email = $1`, [account.email])
    await expect(signedIn(account.email)).resolves.toBeInstanceOf(CookieJar)
  })
})

describe('roles and organisations', () => {
  async function memberId(jar: CookieJar, email: string) {
    const members = await (await request(jar, '/api/members')).json() as MemberView[]
    return members.find(m => m.email === email)!.id
  }

  it('an assistant may not read the team list (403)', async () => {
    const res = await request(await signedIn('assistant'), '/api/members')
    expect(res.status).toBe(403)
    expect((await res.json()).message).toMatch(/managers and handlers/)
  })

  it('a handler reads the team but may not change a role or the organisation (403)', async () => {
    const jar = await signedIn('handler')
    const id = await memberId(jar, demoAccount('assistant').email)
    expect((await request(jar, `/api/members/${id}`, { method: 'PATCH', json: { role: 'manager' } })).status).toBe(403)
    expect((await request(jar, '/api/organisation', { method: 'PATCH', json: { name: 'Taken over' } })).status).toBe(403)
  })

  it('another organisation\'s member is a 404, the same as an id that never existed', async () => {
    const outsider = await signedIn('corrie@northfold.example')
    const foreignId = await memberId(outsider, 'corrie@northfold.example')
    const manager = await signedIn('manager')
    const foreign = await request(manager, `/api/members/${foreignId}`)
    const missing = await request(manager, '/api/members/987654')
    expect(foreign.status).toBe(404)
    expect(missing.status).toBe(404)
    const [a, b] = [await foreign.json(), await missing.json()]
    expect(a.message).toBe(b.message)
    expect((await request(manager, `/api/members/${foreignId}`, { method: 'PATCH', json: { role: 'assistant' } })).status).toBe(404)
  })

  it('a changed role takes effect on the very next request', async () => {
    const manager = await signedIn('manager')
    const ines = await signedIn('ines@larkspur.example')
    const id = await memberId(manager, 'ines@larkspur.example')
    expect((await request(ines, '/api/members')).status).toBe(200)
    expect((await request(manager, `/api/members/${id}`, { method: 'PATCH', json: { role: 'assistant' } })).status).toBe(200)
    expect((await request(ines, '/api/members')).status).toBe(403)
    expect((await request(manager, `/api/members/${id}`, { method: 'PATCH', json: { role: 'handler' } })).status).toBe(200)
    expect((await request(ines, '/api/members')).status).toBe(200)
  })

  it('the last manager cannot be demoted (409)', async () => {
    const corrie = await signedIn('corrie@northfold.example')
    const id = await memberId(corrie, 'corrie@northfold.example')
    const res = await request(corrie, `/api/members/${id}`, { method: 'PATCH', json: { role: 'handler' } })
    expect(res.status).toBe(409)
  })

  it('a user in two organisations switches between them, and only into their own', async () => {
    const jar = await signedIn('manager')
    const orgs = await (await request(jar, '/api/organisations')).json() as { organisation: { id: number, name: string } }[]
    expect(orgs.map(o => o.organisation.name)).toEqual(['Larkspur Hollow Kennel', 'Northfold Wire Terrier Club'])
    const northfold = orgs.find(o => o.organisation.name.startsWith('Northfold'))!.organisation.id
    const { csrfToken } = await (await request(jar, '/api/auth/csrf')).json() as { csrfToken: string }

    await request(jar, '/api/auth/session', { method: 'POST', json: { csrfToken, data: { organisationId: northfold } } })
    let me = await (await request(jar, '/api/me')).json() as MeView
    expect(me.organisation?.name).toBe('Northfold Wire Terrier Club')
    expect(me.role).toBe('handler')

    await request(jar, '/api/auth/session', { method: 'POST', json: { csrfToken, data: { organisationId: 999999 } } })
    me = await (await request(jar, '/api/me')).json() as MeView
    expect(me.organisation?.name).toBe('Northfold Wire Terrier Club')

    // Back to the kennel, which sign-in remembers for the tests that follow.
    const larkspur = orgs.find(o => o.organisation.name.startsWith('Larkspur'))!.organisation.id
    await request(jar, '/api/auth/session', { method: 'POST', json: { csrfToken, data: { organisationId: larkspur } } })
    expect(((await (await request(jar, '/api/me')).json()) as MeView).organisation?.name).toBe('Larkspur Hollow Kennel')
  })
})

describe('bad bodies', () => {
  it.each([
    ['malformed JSON', '{"role": ', /not valid JSON/],
    ['an empty object', '{}', /role/],
    ['an unknown role', '{"role":"owner"}', /role/],
    ['an extra field', '{"role":"handler","organisationId":2}', /organisationId/],
  ])('%s is a 400 that says why', async (_label, body, message) => {
    const manager = await signedIn('manager')
    const members = await (await request(manager, '/api/members')).json() as MemberView[]
    const target = members.find(m => m.role === 'assistant')!
    const res = await request(manager, `/api/members/${target.id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body })
    expect(res.status).toBe(400)
    expect((await res.json()).message).toMatch(message)
  })

  it('a bad time zone is a 400 naming the field, and nothing changes', async () => {
    const manager = await signedIn('manager')
    const res = await request(manager, '/api/organisation', { method: 'PATCH', json: { timeZone: 'Mars/Olympus' } })
    expect(res.status).toBe(400)
    expect((await res.json()).message).toMatch(/^timeZone:/)
    const org = await (await request(manager, '/api/organisation')).json()
    expect(org.timeZone).toBe('Europe/London')
  })

  it('a non-numeric id is a 400, not a 500', async () => {
    const res = await request(await signedIn('manager'), '/api/members/abc')
    expect(res.status).toBe(400)
  })
})
