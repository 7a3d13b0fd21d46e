import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeSequelize } from '../../../server/database/connection'
import type { MemberView } from '../../../shared/types/organisation'
import type { UnsubscribeLookupView, WeeklyPreviewView, WeeklyRecipientsView, WeeklySendResult, WeeklySettingsView, WeeklySubscriptionView } from '../../../shared/types/weekly'
import { isoWeekRange } from '../../../shared/weekly'
import { request, signedIn, type CookieJar } from '../helpers/http'
import { cloneDemo, type DemoClone } from '../helpers/weeklyOrg'

// The weekly-status routes: who may call them, what they refuse, and what they answer. Each
// part that sends works on its own copy of the invented demo (seeders/), so no other test's mail
// or run of this week changes what it sees. Mail delivery itself is tests/e2e/api/weeklyDelivery.test.ts.

const run = Date.now().toString(36)
let clone: DemoClone
let manager: CookieJar

beforeAll(async () => {
  clone = await cloneDemo(`wk-api-${run}`)
  manager = await signedIn(clone.person('manager'))
})

afterAll(async () => {
  await closeSequelize()
})

async function json<T>(jar: CookieJar | null, path: string, init: RequestInit & { json?: unknown } = {}): Promise<{ status: number, body: T }> {
  const res = await request(jar, path, init)
  return { status: res.status, body: await res.json() as T }
}

type ErrorBody = { message: string, data?: { fields?: Record<string, string> } }
const fieldsOf = (body: unknown) => Object.keys((body as ErrorBody).data?.fields ?? {})

describe('who may call the weekly routes', () => {
  const managerOnly: [string, string, unknown?][] = [
    ['GET', '/api/weekly/settings'],
    ['PATCH', '/api/weekly/settings', { hour: 8 }],
    ['GET', '/api/weekly/recipients'],
    ['GET', '/api/weekly/preview?userId=1'],
    ['POST', '/api/weekly/send-now', {}],
  ]

  it.each(managerOnly)('%s %s is 401 without a session', async (method, path, body) => {
    expect((await request(null, path, { method, json: body })).status).toBe(401)
  })

  it.each(managerOnly)('%s %s is 403 for handlers and assistants', async (method, path, body) => {
    for (const role of ['handler', 'assistant'] as const) {
      const res = await request(await signedIn(role), path, { method, json: body })
      expect(res.status, role).toBe(403)
    }
  })
})

describe('settings', () => {
  it('start at Monday 07:00 on the organisation\'s clock, on, managers and handlers only (the seed default)', async () => {
    const { status, body } = await json<WeeklySettingsView>(await signedIn('manager'), '/api/weekly/settings')
    expect(status).toBe(200)
    expect(body).toMatchObject({ day: 1, hour: 7, enabled: true, toAssistants: false, timeZone: 'Europe/London' })
    expect(body.week).toMatch(/^\d{4}-W\d{2}$/)
  })

  it.each([
    [{ day: 0 }, 'day'],
    [{ day: 8 }, 'day'],
    [{ day: 2.5 }, 'day'],
    [{ hour: 24 }, 'hour'],
    [{ hour: -1 }, 'hour'],
    [{ hour: '7' }, 'hour'],
    [{ enabled: 'yes' }, 'enabled'],
    [{ toAssistants: 1 }, 'toAssistants'],
    [{}, '(body)'],
    [{ timeZone: 'Europe/Paris' }, '(body)'],
  ])('PATCH %j is a 400 naming %s', async (patch, field) => {
    const { status, body } = await json(manager, '/api/weekly/settings', { method: 'PATCH', json: patch })
    expect(status).toBe(400)
    expect(fieldsOf(body)).toContain(field)
  })

  it('PATCH moves the send time, read on the organisation\'s wall clock', async () => {
    const { status, body } = await json<WeeklySettingsView>(manager, '/api/weekly/settings', { method: 'PATCH', json: { day: 3, hour: 9 } })
    expect(status).toBe(200)
    expect(body).toMatchObject({ day: 3, hour: 9, enabled: true })
    // Wednesday 09:00 in London, inside this ISO week.
    const wall = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/London', weekday: 'long', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(body.sendAt))
    expect(wall).toBe('Wednesday 09:00')
    const { start, end } = isoWeekRange(body.week)
    const sendDate = new Date(body.sendAt).toISOString().slice(0, 10)
    expect(sendDate >= start && sendDate <= end).toBe(true)
    expect(new Date(body.nextSendAt!).getTime()).toBeGreaterThan(Date.now())
    expect((await json<WeeklySettingsView>(manager, '/api/weekly/settings')).body).toMatchObject({ day: 3, hour: 9 })
    // Back to "due from Monday 00:00", which the rest of this file relies on.
    await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { day: 1, hour: 0 } })
  })

  it('turned off, there is no next send time', async () => {
    const off = await json<WeeklySettingsView>(manager, '/api/weekly/settings', { method: 'PATCH', json: { enabled: false } })
    expect(off.body).toMatchObject({ enabled: false, nextSendAt: null })
    const on = await json<WeeklySettingsView>(manager, '/api/weekly/settings', { method: 'PATCH', json: { enabled: true } })
    expect(on.body.nextSendAt).not.toBeNull()
  })
})

describe('recipients', () => {
  it('lists every member, managers and handlers as receiving; assistants only when the organisation says so', async () => {
    const { body } = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')
    expect(body.recipients.map(r => r.role)).toEqual(['manager', 'handler', 'handler', 'assistant', 'assistant'])
    for (const r of body.recipients) {
      expect(r).toMatchObject(r.role === 'assistant'
        ? { receives: false, state: 'not-a-recipient', delivery: null }
        : { receives: true, state: 'not-yet', delivery: null, unsubscribed: false })
    }
    await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { toAssistants: true } })
    const after = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')
    expect(after.body.recipients.filter(r => r.role === 'assistant').every(r => r.receives && r.state === 'not-yet')).toBe(true)
    await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { toAssistants: false } })
  })

  it('gives the ISO week with its Monday and Sunday, and takes another week', async () => {
    const { body } = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients?week=2026-W53')
    // DESIGN.md §6: 2026-12-31 is 2026-W53-4, so the week runs from Monday 28 December to Sunday 3 January.
    expect(body).toMatchObject({ week: '2026-W53', weekStart: '2026-12-28', weekEnd: '2027-01-03' })
  })

  it.each(['2027-W53', '2026-W54', 'next', '2026-49'])('?week=%s is a 400 naming week (2027 has 52 ISO weeks)', async (week) => {
    const { status, body } = await json(manager, `/api/weekly/recipients?week=${week}`)
    expect(status).toBe(400)
    expect(fieldsOf(body)).toEqual(['week'])
  })
})

describe('preview', () => {
  it('is the message the member would get, scoped to them, with the unsubscribe headers', async () => {
    const tobias = clone.person('tobias@larkspur.example')
    const { status, body } = await json<WeeklyPreviewView>(manager, `/api/weekly/preview?userId=${tobias.userId}`)
    expect(status).toBe(200)
    expect(body).toMatchObject({ source: 'now', receives: true, state: 'not-yet', member: { userId: tobias.userId, role: 'handler' } })
    expect(body.subject).toMatch(new RegExp(`^Week \\d+ at ${clone.kennelName.replace(/[()]/g, '\\$&')}: \\d+ of \\d+ dogs on track$`))
    expect(body.html).toMatch(/^<!DOCTYPE html>/)
    expect(body.text).toContain('DOGS BY THEIR NEXT SHOW')
    // RFC 8058 §3.1.
    expect(body.headers['List-Unsubscribe']).toMatch(/^<http:\/\/.+\/api\/public\/unsubscribe\/\d+-\d+-[\w-]{43}>$/)
    expect(body.headers['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click')
  })

  it('of an assistant says they get none while assistants are not sent it, and holds only their tasks', async () => {
    const pip = clone.person('assistant')
    const { body } = await json<WeeklyPreviewView>(manager, `/api/weekly/preview?userId=${pip.userId}`)
    expect(body).toMatchObject({ receives: false, state: 'not-a-recipient' })
    expect(body.text).toContain('YOUR TASKS THIS WEEK')
    expect(body.text).not.toContain('DOGS BY THEIR NEXT SHOW')
  })

  it('answers 400 for a bad userId and 404 for someone outside the organisation', async () => {
    const bad = await json(manager, '/api/weekly/preview?userId=abc')
    expect(bad.status).toBe(400)
    expect(fieldsOf(bad.body)).toEqual(['userId'])
    const corrie = clone.person('corrie@northfold.example')
    expect((await request(manager, `/api/weekly/preview?userId=${corrie.userId}`)).status).toBe(404)
    expect((await request(manager, '/api/weekly/preview?userId=2147483647')).status).toBe(404)
  })
})

describe('send now', () => {
  it('refuses a body it cannot read, naming the field', async () => {
    for (const [payload, field] of [[{ userId: 'me' }, 'userId'], [{ userId: 0 }, 'userId'], [{ everyone: true }, '(body)']] as const) {
      const { status, body } = await json(manager, '/api/weekly/send-now', { method: 'POST', json: payload })
      expect(status, JSON.stringify(payload)).toBe(400)
      expect(fieldsOf(body)).toContain(field)
    }
    // Another organisation's member is not one of ours.
    const corrie = clone.person('corrie@northfold.example')
    const foreign = await json(manager, '/api/weekly/send-now', { method: 'POST', json: { userId: corrie.userId } })
    expect(foreign.status).toBe(400)
    expect(fieldsOf(foreign.body)).toEqual(['userId'])
  })

  it('queues one member\'s status once; a second time it is already sent', async () => {
    const ines = clone.person('ines@larkspur.example')
    const first = await json<WeeklySendResult>(manager, '/api/weekly/send-now', { method: 'POST', json: { userId: ines.userId } })
    expect(first.status).toBe(201)
    expect(first.body.results).toEqual([{ userId: ines.userId, name: ines.name, email: ines.email, outcome: 'queued', status: 'pending' }])
    const again = await json<WeeklySendResult>(manager, '/api/weekly/send-now', { method: 'POST', json: { userId: ines.userId } })
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ queued: 0, results: [{ userId: ines.userId, outcome: 'already-sent' }] })
    // The preview is now the message in the outbox.
    const preview = await json<WeeklyPreviewView>(manager, `/api/weekly/preview?userId=${ines.userId}`)
    expect(preview.body.source).toBe('outbox')
  })

  it('for everyone queues the rest and says who already had it and who is not sent it', async () => {
    const { status, body } = await json<WeeklySendResult>(manager, '/api/weekly/send-now', { method: 'POST', json: {} })
    expect(status).toBe(201)
    const outcome = (email: string) => body.results.find(r => r.email === email)?.outcome
    expect(outcome(clone.person('manager').email)).toBe('queued')
    expect(outcome(clone.person('tobias@larkspur.example').email)).toBe('queued')
    expect(outcome(clone.person('ines@larkspur.example').email)).toBe('already-sent')
    expect(outcome(clone.person('assistant').email)).toBe('not-a-recipient')
    expect(body.queued).toBe(2)
    const listed = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')
    for (const r of listed.body.recipients) expect(r.delivery === null, r.email).toBe(r.role === 'assistant')
  })

  it('two requests at the same moment queue each member once between them', async () => {
    const other = await cloneDemo(`wk-race-${run}`)
    const jar = await signedIn(other.person('manager'))
    const both = await Promise.all([1, 2].map(() => json<WeeklySendResult>(jar, '/api/weekly/send-now', { method: 'POST', json: {} })))
    const queued = both.flatMap(b => b.body.results.filter(r => r.outcome === 'queued').map(r => r.email))
    expect(queued.sort()).toEqual([other.person('manager').email, other.person('tobias@larkspur.example').email, other.person('ines@larkspur.example').email].sort())
  })
})

describe('unsubscribe links', () => {
  async function tokenOf(userId: number) {
    const { body } = await json<WeeklyPreviewView>(manager, `/api/weekly/preview?userId=${userId}`)
    return /\/api\/public\/unsubscribe\/([^>]+)>$/.exec(body.headers['List-Unsubscribe']!)![1]!
  }

  it('say whose weekly status from which organisation they stop, without a session', async () => {
    const tobias = clone.person('tobias@larkspur.example')
    const { status, body } = await json<UnsubscribeLookupView>(null, `/api/public/unsubscribe/${await tokenOf(tobias.userId)}`)
    expect(status).toBe(200)
    expect(body).toEqual({ name: tobias.name, email: tobias.email, organisationName: clone.kennelName, kind: 'weekly_status', unsubscribed: false, unsubscribedAt: null })
  })

  it('cannot be altered to name someone else, or made up (404)', async () => {
    const tobias = clone.person('tobias@larkspur.example')
    const ines = clone.person('ines@larkspur.example')
    const token = await tokenOf(tobias.userId)
    const swapped = token.replace(/^\d+-/, `${ines.userId}-`)
    expect((await request(null, `/api/public/unsubscribe/${swapped}`)).status).toBe(404)
    expect((await request(null, `/api/public/unsubscribe/${swapped}`, { method: 'POST' })).status).toBe(404)
    const flipped = token.slice(0, -1) + (token.endsWith('A') ? 'B' : 'A')
    expect((await request(null, `/api/public/unsubscribe/${flipped}`)).status).toBe(404)
    const malformed = await json(null, '/api/public/unsubscribe/not-a-token')
    expect(malformed.status).toBe(400)
    expect(fieldsOf(malformed.body)).toEqual(['token'])
  })

  it('unsubscribe with the one-click POST of RFC 8058, in either form encoding, and again changes nothing', async () => {
    const tobias = clone.person('tobias@larkspur.example')
    const path = `/api/public/unsubscribe/${await tokenOf(tobias.userId)}`
    // RFC 8058 §3.2: the body is "List-Unsubscribe=One-Click", sent without cookies.
    const form = await json<UnsubscribeLookupView>(null, path, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'List-Unsubscribe=One-Click' })
    expect(form.status).toBe(200)
    expect(form.body).toMatchObject({ unsubscribed: true })
    const multipart = new FormData()
    multipart.set('List-Unsubscribe', 'One-Click')
    const again = await json<UnsubscribeLookupView>(null, path, { method: 'POST', body: multipart })
    expect(again.status).toBe(200)
    expect(again.body.unsubscribedAt).toBe(form.body.unsubscribedAt)

    const listed = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients?week=2030-W10')
    expect(listed.body.recipients.find(r => r.userId === tobias.userId)).toMatchObject({ unsubscribed: true, receives: false, state: 'unsubscribed', unsubscribedAt: form.body.unsubscribedAt })

    // The same link undoes it.
    const undo = await json<UnsubscribeLookupView>(null, path, { method: 'DELETE' })
    expect(undo.body).toMatchObject({ unsubscribed: false, unsubscribedAt: null })
  })

  it('withdraw the member\'s weekly status still waiting in the outbox', async () => {
    // No SMTP server listens during this file, so the message queued above for Ines still waits.
    const ines = clone.person('ines@larkspur.example')
    const before = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')
    expect(before.body.recipients.find(r => r.userId === ines.userId)?.state).toMatch(/^(pending|sending)$/)
    const path = `/api/public/unsubscribe/${await tokenOf(ines.userId)}`
    expect((await request(null, path, { method: 'POST' })).status).toBe(200)
    const after = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')
    expect(after.body.recipients.find(r => r.userId === ines.userId)).toMatchObject({ state: 'cancelled', unsubscribed: true, delivery: { status: 'cancelled' } })
    // Subscribing again does not bring this week's back: the outbox key holds the week.
    await request(null, path, { method: 'DELETE' })
    const again = await json<WeeklySendResult>(manager, '/api/weekly/send-now', { method: 'POST', json: { userId: ines.userId } })
    expect(again.body.results).toEqual([expect.objectContaining({ outcome: 'already-sent', status: 'cancelled' })])
  })

  it('an unsubscribed member is not sent this week\'s status by "send now"', async () => {
    const other = await cloneDemo(`wk-unsub-${run}`)
    const jar = await signedIn(other.person('manager'))
    const tobias = other.person('tobias@larkspur.example')
    const preview = await json<WeeklyPreviewView>(jar, `/api/weekly/preview?userId=${tobias.userId}`)
    const path = preview.body.headers['List-Unsubscribe']!.replace(/^<https?:\/\/[^/]+|>$/g, '')
    await request(null, path, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'List-Unsubscribe=One-Click' })
    const { body } = await json<WeeklySendResult>(jar, '/api/weekly/send-now', { method: 'POST', json: {} })
    expect(body.results.find(r => r.userId === tobias.userId)).toMatchObject({ outcome: 'unsubscribed', status: null })
    expect(body.results.find(r => r.email === other.person('manager').email)?.outcome).toBe('queued')
  })
})

describe('my own subscription', () => {
  it('any member reads and changes their own, and a manager sees it on the list', async () => {
    const ines = clone.person('ines@larkspur.example')
    const jar = await signedIn(ines)
    const settings = (await json<WeeklySettingsView>(manager, '/api/weekly/settings')).body
    // What the person is told of the sending is the organisation's own settings, read back.
    expect((await json<WeeklySubscriptionView>(jar, '/api/weekly/subscription')).body).toEqual({
      subscribed: true, unsubscribedAt: null, sentToRole: settings.enabled, day: settings.day, hour: settings.hour, timeZone: settings.timeZone, nextSendAt: settings.nextSendAt,
    })
    const off = await json<WeeklySubscriptionView>(jar, '/api/weekly/subscription', { method: 'PUT', json: { subscribed: false } })
    expect(off.body.subscribed).toBe(false)
    const members = (await json<MemberView[]>(manager, '/api/members')).body
    expect(members.some(m => m.userId === ines.userId)).toBe(true)
    const listed = await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients?week=2030-W11')
    expect(listed.body.recipients.find(r => r.userId === ines.userId)?.unsubscribed).toBe(true)
    const on = await json<WeeklySubscriptionView>(jar, '/api/weekly/subscription', { method: 'PUT', json: { subscribed: true } })
    expect(on.body).toMatchObject({ subscribed: true, unsubscribedAt: null })
    const bad = await json(jar, '/api/weekly/subscription', { method: 'PUT', json: { subscribed: 'no' } })
    expect(bad.status).toBe(400)
    expect(fieldsOf(bad.body)).toEqual(['subscribed'])
  })

  it('tells an assistant whether their role gets it at all, as the organisation\'s setting says', async () => {
    const jar = await signedIn(clone.person('pip@larkspur.example'))
    const before = (await json<WeeklySettingsView>(manager, '/api/weekly/settings')).body
    for (const toAssistants of [true, false]) {
      expect((await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { toAssistants } })).status).toBe(200)
      expect((await json<WeeklySubscriptionView>(jar, '/api/weekly/subscription')).body.sentToRole).toBe(toAssistants && before.enabled)
    }
    // With the weekly status off, no role gets it, a handler neither.
    const handler = await signedIn(clone.person('ines@larkspur.example'))
    expect((await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { enabled: false } })).status).toBe(200)
    expect((await json<WeeklySubscriptionView>(handler, '/api/weekly/subscription')).body).toMatchObject({ sentToRole: false, nextSendAt: null })
    await json(manager, '/api/weekly/settings', { method: 'PATCH', json: { toAssistants: before.toAssistants, enabled: before.enabled } })
  })
})
