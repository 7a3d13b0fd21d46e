import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { InvitationAcceptResult, InvitationLookupView, InvitationView } from '../../../shared/types/invitations'
import type { MeView } from '../../../shared/types/organisation'
import { type CookieJar, request, signedIn } from '../helpers/http'
import { expectWellFormedMail, invite, inviteAndJoin, invitationLink, mailsTo, memberByEmail, removeIfMember, signInAs, tokenOf, waitForMail, type Smtp } from '../helpers/invitations'
import { startSmtp } from '../helpers/smtp'

// Every person here is invented; `.example` is reserved (RFC 2606 §3), so nothing can reach anyone.
const FEN = { email: 'fen.aldous@guests.example', name: 'Fen Aldous', password: 'fen-first-password' }
const GUESTS = ['resend.rook@guests.example', 'revoke.ruth@guests.example', 'expired.ezra@guests.example', 'other.kennel@guests.example', 'roles.rae@guests.example', 'waiting.wren@guests.example']

const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let smtp: Smtp
let manager: CookieJar
let northfoldManager: CookieJar

beforeAll(async () => {
  await db.connect()
  smtp = await startSmtp()
  manager = await signedIn('manager')
  northfoldManager = await signedIn('corrie@northfold.example')
})

afterAll(async () => {
  // Leave the demo teams as seeded for the files that come after: they count members.
  for (const email of [FEN.email, ...GUESTS]) {
    await removeIfMember(manager, email)
    await removeIfMember(northfoldManager, email)
  }
  for (const jar of [manager, northfoldManager]) {
    const open = await (await request(jar, '/api/invitations')).json() as InvitationView[]
    for (const inv of open) await request(jar, `/api/invitations/${inv.id}`, { method: 'DELETE' })
  }
  await smtp.stop()
  await db.end()
})

async function lookup(token: string) {
  return request(null, `/api/public/invitations/${token}`)
}

async function accept(token: string, body: object) {
  return request(null, `/api/public/invitations/${token}/accept`, { method: 'POST', json: body })
}

async function openInvitations(jar: CookieJar) {
  return await (await request(jar, '/api/invitations')).json() as InvitationView[]
}

const MANAGER_ROUTES = [
  ['GET', '/api/invitations'],
  ['POST', '/api/invitations'],
  ['POST', '/api/invitations/1/resend'],
  ['DELETE', '/api/invitations/1'],
  ['DELETE', '/api/members/1'],
] as const

describe('who may use the invitation routes', () => {
  it.each(MANAGER_ROUTES)('%s %s without a session is 401', async (method, path) => {
    expect((await request(null, path, { method, json: method === 'POST' ? {} : undefined })).status).toBe(401)
  })

  it.each(MANAGER_ROUTES)('an assistant gets 403 on %s %s', async (method, path) => {
    const jar = await signedIn('assistant')
    const res = await request(jar, path, { method, json: method === 'POST' ? { email: 'x@guests.example', role: 'assistant' } : undefined })
    expect(res.status).toBe(403)
  })

  it('a handler reads the open invitations, without any token, but may not invite, resend, revoke or remove (403)', async () => {
    const { result } = await invite(smtp, manager, { email: GUESTS[4]!, role: 'assistant' })
    const handler = await signedIn('handler')
    const res = await request(handler, '/api/invitations')
    expect(res.status).toBe(200)
    const text = await res.text()
    expect(text).toContain(GUESTS[4])
    expect(text).not.toMatch(/token/i)
    const id = result.invitation.id
    expect((await request(handler, '/api/invitations', { method: 'POST', json: { email: 'x@guests.example', role: 'assistant' } })).status).toBe(403)
    expect((await request(handler, `/api/invitations/${id}/resend`, { method: 'POST' })).status).toBe(403)
    expect((await request(handler, `/api/invitations/${id}`, { method: 'DELETE' })).status).toBe(403)
    const member = await memberByEmail(manager, 'juno@larkspur.example')
    expect((await request(handler, `/api/members/${member!.id}`, { method: 'DELETE' })).status).toBe(403)
  })

  it.each([
    [{ email: 'not an address', role: 'assistant' }, 'email'],
    [{ role: 'assistant' }, 'email'],
    [{ email: 'x@guests.example', role: 'owner' }, 'role'],
    [{ email: 'x@guests.example', role: 'assistant', name: 'A' }, 'name'],
    [{ email: 'x@guests.example', role: 'assistant', organisationId: 2 }, '(body)'],
  ])('a bad invitation %j is a 400 naming %s', async (body, field) => {
    const res = await request(manager, '/api/invitations', { method: 'POST', json: body })
    expect(res.status).toBe(400)
    expect(Object.keys((await res.json()).data.fields)).toContain(field)
  })

  it('a malformed id or link is a 400 naming it, an unknown link a 404', async () => {
    const badId = await request(manager, '/api/invitations/abc/resend', { method: 'POST' })
    expect(badId.status).toBe(400)
    expect((await badId.json()).data.fields).toHaveProperty('id')
    const badToken = await lookup('too-short')
    expect(badToken.status).toBe(400)
    expect((await badToken.json()).data.fields).toHaveProperty('token')
    const unknown = await lookup('A'.repeat(43))
    expect(unknown.status).toBe(404)
    expect((await unknown.json()).message).toMatch(/does not work any more/)
  })

  it('another organisation\'s invitation is a 404, the same as one that never existed', async () => {
    const { result } = await invite(smtp, northfoldManager, { email: GUESTS[3]!, role: 'assistant' })
    const foreign = await request(manager, `/api/invitations/${result.invitation.id}/resend`, { method: 'POST' })
    const missing = await request(manager, '/api/invitations/987654/resend', { method: 'POST' })
    expect(foreign.status).toBe(404)
    expect(missing.status).toBe(404)
    expect((await foreign.json()).message).toBe((await missing.json()).message)
    expect((await request(manager, `/api/invitations/${result.invitation.id}`, { method: 'DELETE' })).status).toBe(404)
    expect((await openInvitations(manager)).map(i => i.email)).not.toContain(GUESTS[3])
  })
})

describe('an invitation, by real mail', () => {
  let token: string

  it('arrives as a well-formed message with the link, and the manager sees it as open', async () => {
    const res = await request(manager, '/api/invitations', { method: 'POST', json: { email: ' Fen.Aldous@Guests.example ', role: 'assistant', name: FEN.name } })
    expect(res.status).toBe(201)
    const created = await res.json()
    expect(created).toMatchObject({ resent: false, invitation: { email: FEN.email, role: 'assistant', name: FEN.name, sentCount: 1, invitedBy: { name: 'Maren Oakhurst' } } })

    const mail = await waitForMail(smtp, FEN.email, 'invites you')
    expectWellFormedMail(mail)
    expect(mail.parsed.subject).toBe('Maren Oakhurst invites you to Larkspur Hollow Kennel on Bloomline')
    expect(mail.parsed.text).toContain('as an assistant')
    expect(mail.parsed.html).toContain('Accept the invitation')
    const link = invitationLink(mail)
    expect(mail.parsed.html).toContain(`href="${link}"`)
    token = tokenOf(link)
    // Only the hash is stored (a 43-character secret hashes to 64 hex digits).
    const { rows } = await db.query('SELECT token_hash FROM invitations WHERE id = $1', [created.invitation.id])
    expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/)
    expect(rows[0].token_hash).not.toContain(token)

    const mine = (await openInvitations(manager)).find(i => i.email === FEN.email)!
    const expires = new Date(mine.expiresAt).getTime() - new Date(mine.sentAt).getTime()
    expect(Math.round(expires / 3_600_000)).toBe(7 * 24)
    await expect.poll(async () => (await openInvitations(manager)).find(i => i.email === FEN.email)?.delivery).toBe('sent')
  })

  it('the link shows who invites whom, and that no account has the address yet', async () => {
    const res = await lookup(token)
    expect(res.status).toBe(200)
    expect(await res.json() as InvitationLookupView).toMatchObject({
      status: 'open', organisationName: 'Larkspur Hollow Kennel', inviterName: 'Maren Oakhurst', role: 'assistant', email: FEN.email, name: FEN.name, hasAccount: false,
    })
  })

  it('refuses a password shorter than 8 characters (400 naming it) and joins nobody', async () => {
    const res = await accept(token, { name: FEN.name, password: 'short' })
    expect(res.status).toBe(400)
    expect((await res.json()).data.fields).toHaveProperty('password')
    expect(await memberByEmail(manager, FEN.email)).toBeUndefined()
  })

  it('works once: the person joins with their name and password and can sign in', async () => {
    const res = await accept(token, { name: FEN.name, password: FEN.password })
    expect(res.status).toBe(200)
    expect(await res.json() as InvitationAcceptResult).toEqual({ email: FEN.email, organisationName: 'Larkspur Hollow Kennel', role: 'assistant', newAccount: true })
    const jar = await signInAs(FEN.email, FEN.password)
    const me = await (await request(jar, '/api/me')).json() as MeView
    expect(me).toMatchObject({ user: { name: FEN.name, email: FEN.email }, organisation: { name: 'Larkspur Hollow Kennel' }, role: 'assistant' })
    expect((await memberByEmail(manager, FEN.email))?.role).toBe('assistant')
    expect((await openInvitations(manager)).map(i => i.email)).not.toContain(FEN.email)
  })

  it('a second use is refused with a clear sentence', async () => {
    const again = await accept(token, { name: 'Someone Else', password: 'another-password' })
    expect(again.status).toBe(410)
    expect((await again.json()).message).toMatch(/already been used to join Larkspur Hollow Kennel/)
    const looked = await (await lookup(token)).json() as InvitationLookupView
    expect(looked).toMatchObject({ status: 'accepted', email: null, hasAccount: null })
  })

  it('inviting an address that is already a member (any case) is a 409 that says so', async () => {
    for (const email of ['FEN.ALDOUS@guests.example', 'Tobias@Larkspur.example']) {
      const res = await request(manager, '/api/invitations', { method: 'POST', json: { email, role: 'handler' } })
      expect(res.status).toBe(409)
      expect((await res.json()).message).toMatch(/is already a member of Larkspur Hollow Kennel/)
    }
  })
})

describe('resend and revoke', () => {
  it('resending sends a new link and the old one stops working; inviting the same address again resends too', async () => {
    const first = await invite(smtp, manager, { email: GUESTS[0]!, role: 'handler' })
    const res = await request(manager, `/api/invitations/${first.result.invitation.id}/resend`, { method: 'POST' })
    expect(res.status).toBe(200)
    expect((await res.json() as InvitationView).sentCount).toBe(2)
    const second = await waitForMail(smtp, GUESTS[0]!, 'invites you', 2)
    expectWellFormedMail(second)
    expect(second.parsed.text).toContain('any earlier invitation link to you no longer works')
    const secondToken = tokenOf(invitationLink(second))
    expect(secondToken).not.toBe(first.token)
    expect((await lookup(first.token)).status).toBe(404)
    expect((await accept(first.token, { name: 'Rook', password: 'rook-password' })).status).toBe(404)
    expect(((await (await lookup(secondToken)).json()) as InvitationLookupView).status).toBe('open')

    const { rows } = await db.query(`SELECT period_key FROM mail_outbox WHERE kind = 'invitation' AND lower(recipient_email) = $1 ORDER BY id`, [GUESTS[0]])
    expect(rows.map(r => r.period_key)).toEqual([`invitation-${first.result.invitation.id}-1`, `invitation-${first.result.invitation.id}-2`])

    // The choice for an address with an open invitation: send that one again, with the new role.
    const again = await request(manager, '/api/invitations', { method: 'POST', json: { email: GUESTS[0], role: 'assistant' } })
    expect(again.status).toBe(200)
    expect(await again.json()).toMatchObject({ resent: true, invitation: { id: first.result.invitation.id, role: 'assistant', sentCount: 3 } })
    const third = await waitForMail(smtp, GUESTS[0]!, 'invites you', 3)
    expect((await lookup(secondToken)).status).toBe(404)
    expect(((await (await lookup(tokenOf(invitationLink(third)))).json()) as InvitationLookupView).role).toBe('assistant')
    expect((await openInvitations(manager)).filter(i => i.email === GUESTS[0])).toHaveLength(1)
  })

  it('revoking makes the link fail with a page that names whom to ask', async () => {
    const { result, token } = await invite(smtp, manager, { email: GUESTS[1]!, role: 'assistant' })
    expect((await request(manager, `/api/invitations/${result.invitation.id}`, { method: 'DELETE' })).status).toBe(204)
    const looked = await (await lookup(token)).json() as InvitationLookupView
    expect(looked).toMatchObject({ status: 'revoked', email: null })
    expect(looked.message).toMatch(/withdrawn; ask Maren Oakhurst/)
    const res = await accept(token, { name: 'Ruth Revoke', password: 'ruth-password' })
    expect(res.status).toBe(410)
    expect(await memberByEmail(manager, GUESTS[1]!)).toBeUndefined()
    expect((await openInvitations(manager)).map(i => i.email)).not.toContain(GUESTS[1])
    expect((await request(manager, `/api/invitations/${result.invitation.id}`, { method: 'DELETE' })).status).toBe(409)
    expect((await request(manager, `/api/invitations/${result.invitation.id}/resend`, { method: 'POST' })).status).toBe(409)
  })

  it('a message still waiting while the mail server is down is withdrawn when the invitation is revoked: no dead link arrives later', async () => {
    await smtp.stop()
    let id: number
    try {
      const res = await request(manager, '/api/invitations', { method: 'POST', json: { email: GUESTS[5], role: 'assistant' } })
      expect(res.status).toBe(201)
      id = (await res.json() as { invitation: InvitationView }).invitation.id
      expect((await request(manager, `/api/invitations/${id}`, { method: 'DELETE' })).status).toBe(204)
      const { rows } = await db.query(`SELECT status FROM mail_outbox WHERE kind = 'invitation' AND period_key = $1`, [`invitation-${id}-1`])
      expect(rows.map(r => r.status)).toEqual(['cancelled'])
    }
    finally {
      await smtp.start()
    }
    // Waits past the first retry (a second in the tests) and finds nothing for the address.
    await new Promise(r => setTimeout(r, 3000))
    expect(mailsTo(smtp, GUESTS[5]!, '')).toHaveLength(0)
  })

  it('an expired link says so and names the manager; resending gives seven fresh days', async () => {
    const { result, token } = await invite(smtp, manager, { email: GUESTS[2]!, role: 'assistant' })
    // Seven days pass: the row's expiry is moved into the past, the app's clock is left alone.
    await db.query(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE id = $1`, [result.invitation.id])
    const looked = await (await lookup(token)).json() as InvitationLookupView
    expect(looked.status).toBe('expired')
    expect(looked.message).toBe('This invitation has expired; ask Maren Oakhurst to send a new one.')
    const res = await accept(token, { name: 'Ezra Late', password: 'ezra-password' })
    expect(res.status).toBe(410)
    expect((await res.json()).message).toBe('This invitation has expired; ask Maren Oakhurst to send a new one.')
    expect((await openInvitations(manager)).find(i => i.id === result.invitation.id)?.expired).toBe(true)

    await request(manager, `/api/invitations/${result.invitation.id}/resend`, { method: 'POST' })
    const fresh = tokenOf(invitationLink(await waitForMail(smtp, GUESTS[2]!, 'invites you', 2)))
    expect(((await (await lookup(fresh)).json()) as InvitationLookupView).status).toBe('open')
    expect((await openInvitations(manager)).find(i => i.id === result.invitation.id)?.expired).toBe(false)
  })
})

describe('a person who already has an account', () => {
  it('joins another organisation with their existing password, which stays as it was', async () => {
    const { token } = await invite(smtp, northfoldManager, { email: 'FEN.Aldous@guests.example', role: 'handler' })
    const looked = await (await lookup(token)).json() as InvitationLookupView
    expect(looked).toMatchObject({ status: 'open', hasAccount: true, organisationName: 'Northfold Wire Terrier Club', inviterName: 'Corrie Vantongeren' })

    const wrong = await accept(token, { password: 'not-fens-password' })
    expect(wrong.status).toBe(400)
    expect((await wrong.json()).data.fields).toHaveProperty('password')
    expect(await memberByEmail(northfoldManager, FEN.email)).toBeUndefined()

    const res = await accept(token, { password: FEN.password, name: 'Not Used' })
    expect(res.status).toBe(200)
    expect(await res.json()).toMatchObject({ newAccount: false, organisationName: 'Northfold Wire Terrier Club', role: 'handler' })
    // Signed in again, they start in the organisation they just joined, with the same password.
    const jar = await signInAs(FEN.email, FEN.password)
    const me = await (await request(jar, '/api/me')).json() as MeView
    expect(me.organisation?.name).toBe('Northfold Wire Terrier Club')
    expect(me.user.name).toBe(FEN.name)
    expect(me.memberships.map(m => m.role).sort()).toEqual(['assistant', 'handler'])
  })
})

describe('changing a role or removing a member', () => {
  it('a removed member gets 403 on their very next request, and the team list drops them', async () => {
    const rae = await inviteAndJoin(smtp, manager, { email: 'roles.rae@guests.example', name: 'Rae Rolle', role: 'handler', password: 'rae-password' })
    expect((await request(rae, '/api/dogs')).status).toBe(200)
    expect((await request(rae, '/api/members')).status).toBe(200)

    const member = (await memberByEmail(manager, 'roles.rae@guests.example'))!
    expect((await request(manager, `/api/members/${member.id}`, { method: 'PATCH', json: { role: 'assistant' } })).status).toBe(200)
    expect((await request(rae, '/api/members')).status).toBe(403)

    // An open task of theirs goes back to nobody.
    const dog = (await (await request(manager, '/api/dogs')).json() as { id: number }[])[0]!
    const task = await (await request(manager, '/api/tasks', { method: 'POST', json: { dogId: dog.id, regions: ['neck'], kind: 'roll', dueDate: '2199-01-01', assigneeId: member.userId } })).json() as { id: number }

    expect((await request(manager, `/api/members/${member.id}`, { method: 'DELETE' })).status).toBe(204)
    const next = await request(rae, '/api/dogs')
    expect(next.status).toBe(403)
    expect((await next.json()).message).toMatch(/no longer a member/)
    expect(await memberByEmail(manager, 'roles.rae@guests.example')).toBeUndefined()
    const after = await (await request(manager, `/api/tasks/${task.id}`)).json() as { assignee: unknown }
    expect(after.assignee).toBeNull()
    // Taking the task off them is in the task's audit trail, by the manager who removed them.
    const { rows: audit } = await db.query(`SELECT action, before->>'assigneeId' AS was, after->>'assigneeId' AS now FROM audit_events WHERE entity = 'task' AND entity_id = $1 ORDER BY id`, [task.id])
    expect(audit.map(r => [r.action, r.was, r.now])).toEqual([['create', null, String(member.userId)], ['update', String(member.userId), null]])
    expect((await request(manager, `/api/tasks/${task.id}`, { method: 'DELETE' })).status).toBe(204)
    expect((await request(manager, `/api/members/${member.id}`, { method: 'DELETE' })).status).toBe(404)
  })

  it('the last manager cannot be removed (409); another organisation\'s member is a 404', async () => {
    const corrie = (await memberByEmail(northfoldManager, 'corrie@northfold.example'))!
    const res = await request(northfoldManager, `/api/members/${corrie.id}`, { method: 'DELETE' })
    expect(res.status).toBe(409)
    expect((await res.json()).message).toMatch(/at least one manager/)
    expect((await request(manager, `/api/members/${corrie.id}`, { method: 'DELETE' })).status).toBe(404)
    expect((await request(manager, '/api/members/99999999999', { method: 'DELETE' })).status).toBe(404)
    expect(mailsTo(smtp, 'corrie@northfold.example', 'invites you')).toEqual([])
  })
})
