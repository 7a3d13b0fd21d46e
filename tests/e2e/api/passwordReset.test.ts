import pg from 'pg'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { PASSWORD_RESET_ANSWER } from '../../../shared/schemas/passwordReset'
import type { PasswordResetLookupView } from '../../../shared/types/invitations'
import { baseUrl, type CookieJar, request, signedIn } from '../helpers/http'
import { expectWellFormedMail, inviteAndJoin, mailsTo, recipientsOf, removeIfMember, signInAs, tokenOf, waitForMail, type Smtp } from '../helpers/invitations'
import { linkIn, startSmtp, type ReceivedMail } from '../helpers/smtp'

// Invented people; `.example` is reserved (RFC 2606 §3).
const SAGE = { email: 'sage.reset@guests.example', name: 'Sage Thornbury', role: 'assistant' as const, password: 'sage-first-password' }
const OTTO = { email: 'otto.limit@guests.example', name: 'Otto Fairweather', role: 'assistant' as const, password: 'otto-first-password' }
const SUBJECT = 'Reset your Bloomline password'

const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let smtp: Smtp
let manager: CookieJar
let sagePassword = SAGE.password

beforeAll(async () => {
  await db.connect()
  smtp = await startSmtp()
  manager = await signedIn('manager')
  await inviteAndJoin(smtp, manager, SAGE)
  await inviteAndJoin(smtp, manager, OTTO)
})

// The hourly limit counts the last hour's requests: age the earlier tests' ones, so each test starts clean.
beforeEach(async () => {
  await db.query(`UPDATE password_resets SET created_at = now() - interval '2 hours'`)
})

afterAll(async () => {
  await removeIfMember(manager, SAGE.email)
  await removeIfMember(manager, OTTO.email)
  await smtp.stop()
  await db.end()
})

async function ask(email: string) {
  return request(null, '/api/public/password-reset', { method: 'POST', json: { email } })
}

function resetLink(mail: ReceivedMail) {
  return linkIn(mail, `${baseUrl}/password/reset/`)
}

async function lookup(token: string) {
  return request(null, `/api/public/password-reset/${token}`)
}

async function confirm(token: string, password: string) {
  return request(null, `/api/public/password-reset/${token}`, { method: 'POST', json: { password } })
}

/** Asks for a reset for Sage and returns the newest link's secret once its message has arrived. */
async function newSageLink() {
  const before = mailsTo(smtp, SAGE.email, SUBJECT).length
  expect((await ask(SAGE.email)).status).toBe(202)
  return tokenOf(resetLink(await waitForMail(smtp, SAGE.email, SUBJECT, before + 1)))
}

describe('asking for a reset', () => {
  it('answers an unknown address exactly as a known one, and sends the unknown one nothing', async () => {
    const unknown = await ask('nobody.here@guests.example')
    const known = await ask(SAGE.email.toUpperCase())
    expect(unknown.status).toBe(202)
    expect(known.status).toBe(unknown.status)
    const [a, b] = [await unknown.json(), await known.json()]
    expect(a).toEqual(b)
    expect(a).toEqual({ message: PASSWORD_RESET_ANSWER })
    // OWASP Forgot Password Cheat Sheet: the answer must not say whether the account exists.
    expect(PASSWORD_RESET_ANSWER).not.toMatch(/no account|not found|unknown|we sent/i)

    const mail = await waitForMail(smtp, SAGE.email, SUBJECT)
    expectWellFormedMail(mail)
    expect(mail.parsed.text).toContain('Hello Sage Thornbury,')
    expect(mail.parsed.text).toContain('Larkspur Hollow Kennel')
    expect(mail.parsed.text).toContain('for one hour')
    expect(mail.parsed.html).toContain(`href="${resetLink(mail)}"`)
    // The unknown address was asked for first; by the time Sage's message is delivered its turn is long over.
    expect(smtp.received.filter(m => recipientsOf(m).includes('nobody.here@guests.example'))).toEqual([])
    const { rows } = await db.query(`SELECT count(*)::int AS n FROM mail_outbox WHERE lower(recipient_email) = 'nobody.here@guests.example'`)
    expect(rows[0].n).toBe(0)
  })

  it.each([
    [{ email: 'not an address' }, 'email'],
    [{}, 'email'],
    [{ email: SAGE.email, userId: 1 }, '(body)'],
  ])('a bad request %j is a 400 naming %s', async (body, field) => {
    const res = await request(null, '/api/public/password-reset', { method: 'POST', json: body })
    expect(res.status).toBe(400)
    expect(Object.keys((await res.json()).data.fields)).toContain(field)
  })

  it('sends at most three messages an hour to one address, and answers the fourth request the same', async () => {
    const before = mailsTo(smtp, OTTO.email, SUBJECT).length
    const answers = []
    for (let i = 0; i < 4; i++) answers.push(await (await ask(OTTO.email)).json())
    expect(new Set(answers.map(a => JSON.stringify(a))).size).toBe(1)
    await waitForMail(smtp, OTTO.email, SUBJECT, before + 1)
    // A later request for another person is served after the fourth one above has been weighed.
    await newSageLink()
    const { rows } = await db.query(`SELECT count(*)::int AS n FROM password_resets r JOIN users u ON u.id = r.user_id WHERE u.email = $1 AND r.created_at > now() - interval '1 hour'`, [OTTO.email])
    expect(rows[0].n).toBe(3)
    // Three messages queued, none for the fourth request; each new link withdraws an older one still
    // waiting to go (its link is dead), so between one and three of them arrive.
    const queued = await db.query(`SELECT status FROM mail_outbox WHERE kind = 'password_reset' AND lower(recipient_email) = $1 AND created_at > now() - interval '1 hour'`, [OTTO.email])
    expect(queued.rows).toHaveLength(3)
    await new Promise(r => setTimeout(r, 2000))
    const arrived = mailsTo(smtp, OTTO.email, SUBJECT).length - before
    expect(arrived).toBeGreaterThanOrEqual(1)
    expect(arrived).toBe(queued.rows.filter(r => r.status === 'sent').length)
  })
})

describe('a reset link', () => {
  it('works once: the password changes, every old session ends, and a second use is refused', async () => {
    const oldSession = (await signInAs(SAGE.email, sagePassword))!
    expect((await request(oldSession, '/api/me')).status).toBe(200)
    const token = await newSageLink()

    const looked = await (await lookup(token)).json() as PasswordResetLookupView
    expect(looked).toMatchObject({ status: 'open', email: SAGE.email, timeZone: 'Europe/London' })
    const { rows } = await db.query('SELECT token_hash FROM password_resets WHERE token_hash = encode(sha256($1::bytea), \'hex\')', [token])
    expect(rows).toHaveLength(1)

    const short = await confirm(token, 'short')
    expect(short.status).toBe(400)
    expect((await short.json()).data.fields).toHaveProperty('password')

    const res = await confirm(token, 'sage-second-password')
    expect(res.status).toBe(200)
    expect(await res.json()).toEqual({ email: SAGE.email })
    // session_version was bumped: the cookie jar signed in before the reset is refused.
    expect((await request(oldSession, '/api/me')).status).toBe(401)
    expect((await request(oldSession, '/api/dogs')).status).toBe(401)
    expect(await signInAs(SAGE.email, sagePassword)).toBeNull()
    sagePassword = 'sage-second-password'
    expect(await signInAs(SAGE.email, sagePassword)).not.toBeNull()

    const again = await confirm(token, 'sage-third-password')
    expect(again.status).toBe(410)
    expect((await again.json()).message).toMatch(/already been used/)
    expect((await (await lookup(token)).json()).status).toBe('used')
    expect(await signInAs(SAGE.email, 'sage-third-password')).toBeNull()
  })

  it('expires after an hour', async () => {
    const token = await newSageLink()
    const { rows } = await db.query(`SELECT round(extract(epoch FROM expires_at - created_at) / 60)::int AS minutes FROM password_resets WHERE token_hash = encode(sha256($1::bytea), 'hex')`, [token])
    expect(rows[0].minutes).toBe(60)
    // The hour passes: the row's expiry is moved into the past; the app's clock is left alone.
    await db.query(`UPDATE password_resets SET expires_at = now() - interval '1 second' WHERE token_hash = encode(sha256($1::bytea), 'hex')`, [token])
    const looked = await (await lookup(token)).json() as PasswordResetLookupView
    expect(looked).toMatchObject({ status: 'expired', email: null })
    expect(looked.message).toMatch(/expired/)
    const res = await confirm(token, 'sage-late-password')
    expect(res.status).toBe(410)
    expect(await signInAs(SAGE.email, 'sage-late-password')).toBeNull()
  })

  it('only the newest link works: asking again makes the older one unusable', async () => {
    const older = await newSageLink()
    const newer = await newSageLink()
    expect(((await (await lookup(older)).json()) as PasswordResetLookupView).status).toBe('expired')
    expect((await confirm(older, 'sage-older-password')).status).toBe(410)
    expect(((await (await lookup(newer)).json()) as PasswordResetLookupView).status).toBe('open')
  })

  it('lifts a sign-in lock-out on the address', async () => {
    await db.query(`INSERT INTO sign_in_locks (email, locked_until) VALUES ($1, now() + interval '15 minutes') ON CONFLICT (email) DO UPDATE SET locked_until = EXCLUDED.locked_until`, [SAGE.email])
    expect(await signInAs(SAGE.email, sagePassword)).toBeNull()
    const token = await newSageLink()
    expect((await confirm(token, 'sage-unlocked-password')).status).toBe(200)
    sagePassword = 'sage-unlocked-password'
    expect(await signInAs(SAGE.email, sagePassword)).not.toBeNull()
  })

  it('a malformed link is a 400 naming it, an unknown one a 404', async () => {
    const bad = await lookup('not-a-token')
    expect(bad.status).toBe(400)
    expect((await bad.json()).data.fields).toHaveProperty('token')
    expect((await lookup('B'.repeat(43))).status).toBe(404)
    expect((await confirm('B'.repeat(43), 'whatever-password')).status).toBe(404)
    const missing = await request(null, `/api/public/password-reset/${'B'.repeat(43)}`, { method: 'POST', json: {} })
    expect(missing.status).toBe(400)
    expect((await missing.json()).data.fields).toHaveProperty('password')
  })
})
