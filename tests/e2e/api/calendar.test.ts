import ICAL from 'ical.js'
import { beforeAll, describe, expect, it } from 'vitest'
import type { PlanView } from '../../../shared/types/kennel'
import { request, type CookieJar } from '../helpers/http'
import { call, inDays, kennelPeople, makeDog, makeShow, ok, TAG, type KennelPeople } from '../helpers/kennelApi'

let p: KennelPeople
const made = {} as Record<'assistantsTask' | 'foreignDog' | 'foreignShow' | 'handlersDog' | 'handlersShow' | 'othersDog' | 'othersShow' | 'othersTask', { id: number }>
// Long enough to need several folds, and full of characters of two and three octets in UTF-8.
const LONG_NOTE = `${TAG} Brosse légère — é à é — `.repeat(12)

/** A fresh private feed URL for a session, by the API that shows it once. */
async function newFeed(jar: CookieJar): Promise<string> {
  const { url } = await ok<{ url: string }>(jar, '/api/calendar/feed', 'POST')
  return url
}

/** The feed (or any .ics) fetched without a session, as a calendar program does. */
async function fetchIcs(url: string, jar: CookieJar | null = null) {
  const path = url.replace(/^https?:\/\/[^/]+/, '')
  const res = await request(jar, path)
  return { res, text: await res.text() }
}

const vevents = (text: string) => new ICAL.Component(ICAL.parse(text)).getAllSubcomponents('vevent')
const uids = (text: string) => vevents(text).map(e => String(e.getFirstPropertyValue('uid')))

beforeAll(async () => {
  p = await kennelPeople()
  made.handlersDog = await makeDog(p.manager, { handlerId: p.ids.handler })
  made.othersDog = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  made.handlersShow = await makeShow(p.manager, 80, { lastDay: inDays(81), entriesCloseDate: inDays(10), entriesCloseTime: '18:30' })
  made.othersShow = await makeShow(p.manager, 40)
  await ok(p.manager, '/api/entries', 'POST', { dogId: made.handlersDog.id, showId: made.handlersShow.id, classCode: 'kc:open' })
  await ok(p.manager, '/api/entries', 'POST', { dogId: made.othersDog.id, showId: made.othersShow.id, classCode: 'kc:open' })
  made.assistantsTask = await ok(p.manager, '/api/tasks', 'POST', { dogId: made.handlersDog.id, kind: 'layer', regions: ['neck'], dueDate: inDays(3), assigneeId: p.ids.assistant, notes: LONG_NOTE })
  made.othersTask = await ok(p.manager, '/api/tasks', 'POST', { dogId: made.othersDog.id, kind: 'strip', regions: ['neck'], dueDate: inDays(4), assigneeId: p.ids.assistant2 })
  made.foreignDog = await makeDog(p.foreign)
  made.foreignShow = await makeShow(p.foreign, 20)
  await ok(p.foreign, '/api/entries', 'POST', { dogId: made.foreignDog.id, showId: made.foreignShow.id, classCode: 'kc:open' }).catch(() => undefined)
})

describe('a calendar feed (RFC 5545)', () => {
  let text: string
  beforeAll(async () => {
    const { res, text: body } = await fetchIcs(await newFeed(p.manager))
    expect(res.status).toBe(200)
    // RFC 5545 §8.1: the media type text/calendar; a private feed stays out of shared caches (RFC 9111 §5.2.2.7).
    expect(res.headers.get('content-type')).toMatch(/^text\/calendar; charset=utf-8/i)
    expect(res.headers.get('cache-control')).toMatch(/private/)
    text = body
  })

  it('parses with ical.js and has PRODID and VERSION exactly once (§3.6, §3.7.3, §3.7.4)', () => {
    const cal = new ICAL.Component(ICAL.parse(text))
    expect(cal.name).toBe('vcalendar')
    expect(cal.getAllProperties('prodid')).toHaveLength(1)
    expect(cal.getAllProperties('version')).toHaveLength(1)
    // RFC 5545 §3.7.4: "2.0" is the version of this memo.
    expect(cal.getFirstPropertyValue('version')).toBe('2.0')
  })

  it('gives every VEVENT one UID and one DTSTAMP in UTC (§3.6.1, §3.8.7.2)', () => {
    const events = vevents(text)
    expect(events.length).toBeGreaterThan(0)
    for (const event of events) {
      expect(event.getAllProperties('uid')).toHaveLength(1)
      expect(event.getAllProperties('dtstamp')).toHaveLength(1)
    }
    // RFC 5545 §3.8.7.2: DTSTAMP "MUST be specified in the UTC time format", i.e. ending in Z (§3.3.5 form #2).
    const stamps = text.split('\r\n').filter(l => l.startsWith('DTSTAMP'))
    expect(stamps.length).toBe(events.length)
    for (const line of stamps) expect(line).toMatch(/^DTSTAMP:\d{8}T\d{6}Z$/)
  })

  it('shows a show\'s days as an all-day event with DATE values and an exclusive DTEND (§3.6.1)', () => {
    const show = vevents(text).find(e => e.getFirstPropertyValue('uid') === `show-${made.handlersShow.id}@bloomline`)!
    expect(show).toBeDefined()
    const start = show.getFirstProperty('dtstart')!
    const end = show.getFirstProperty('dtend')!
    expect(start.type).toBe('date')
    expect(end.type).toBe('date')
    // Two show days (80 and 81 days out): DTEND is the day after the last (RFC 5545 §3.6.1 note on DTEND).
    expect(String(start.getFirstValue())).toBe(inDays(80))
    expect(String(end.getFirstValue())).toBe(inDays(82))
  })

  it('shows entries closing as a timed event at a UTC instant', async () => {
    const close = vevents(text).find(e => e.getFirstPropertyValue('uid') === `close-${made.handlersShow.id}@bloomline`)!
    expect(close).toBeDefined()
    const show = await ok(p.manager, `/api/shows/${made.handlersShow.id}`, 'GET')
    const start = close.getFirstPropertyValue('dtstart') as ICAL.Time
    expect(start.isDate).toBe(false)
    expect(start.toJSDate().toISOString()).toBe(show.entriesCloseAt)
  })

  it('folds lines at 75 octets without splitting a UTF-8 character (§3.1)', async () => {
    // The bytes as sent: text() would hide a split character behind U+FFFD.
    const path = (await newFeed(p.assistant)).replace(/^https?:\/\/[^/]+/, '')
    const bytes = Buffer.from(await (await request(null, path)).arrayBuffer())
    // latin1 maps each byte to one character and back, so the lines split on CRLF are the exact bytes.
    const lines = bytes.toString('latin1').split('\r\n').map(l => Buffer.from(l, 'latin1'))
    const decoder = new TextDecoder('utf-8', { fatal: true })
    for (const line of lines) {
      // RFC 5545 §3.1: "Lines of text SHOULD NOT be longer than 75 octets, excluding the line break."
      expect(line.length).toBeLessThanOrEqual(75)
      // RFC 5545 §3.1: a fold must not split a multi-octet UTF-8 character, so each physical line decodes alone.
      expect(() => decoder.decode(line)).not.toThrow()
    }
    // The long note really was folded: continuation lines begin with one space (§3.1).
    expect(lines.filter(l => l[0] === 0x20).length).toBeGreaterThan(3)
    // Unfolded, the note comes back whole (§3.1: unfolding removes CRLF and one whitespace).
    const task = vevents(bytes.toString('utf8')).find(e => e.getFirstPropertyValue('uid') === `task-${made.assistantsTask.id}@bloomline`)!
    expect(String(task.getFirstPropertyValue('description'))).toContain(LONG_NOTE.trim())
  })

  it('keeps every UID the same across two fetches', async () => {
    const url = await newFeed(p.handler)
    const first = uids((await fetchIcs(url)).text)
    const second = uids((await fetchIcs(url)).text)
    expect(first.length).toBeGreaterThan(0)
    expect(second).toEqual(first)
  })
})

describe('what a feed holds', () => {
  it('gives a handler only their dogs\' shows', async () => {
    const ids = uids((await fetchIcs(await newFeed(p.handler))).text)
    expect(ids).toContain(`show-${made.handlersShow.id}@bloomline`)
    expect(ids).toContain(`close-${made.handlersShow.id}@bloomline`)
    expect(ids.some(id => id.startsWith(`plan-${made.handlersDog.id}-`))).toBe(true)
    expect(ids).not.toContain(`show-${made.othersShow.id}@bloomline`)
    expect(ids).not.toContain(`task-${made.othersTask.id}@bloomline`)
  })

  it('gives an assistant only their own tasks, with the cautions, and no shows', async () => {
    const feed = (await fetchIcs(await newFeed(p.assistant))).text
    const ids = uids(feed)
    expect(ids).toContain(`task-${made.assistantsTask.id}@bloomline`)
    expect(ids).not.toContain(`task-${made.othersTask.id}@bloomline`)
    expect(ids.filter(id => /^(show|close|plan)-/.test(id))).toEqual([])
    const task = vevents(feed).find(e => e.getFirstPropertyValue('uid') === `task-${made.assistantsTask.id}@bloomline`)!
    // DESIGN.md §7: wherever coat work is prompted, the cautions come with it.
    expect(String(task.getFirstPropertyValue('description'))).toMatch(/Cautions/)
    const start = task.getFirstProperty('dtstart')!
    expect(start.type).toBe('date')
  })

  it('never shows another organisation\'s data', async () => {
    const ids = uids((await fetchIcs(await newFeed(p.manager))).text)
    expect(ids).not.toContain(`show-${made.foreignShow.id}@bloomline`)
    const foreignIds = uids((await fetchIcs(await newFeed(p.foreign))).text)
    expect(foreignIds).toContain(`show-${made.foreignShow.id}@bloomline`)
    expect(foreignIds).not.toContain(`show-${made.handlersShow.id}@bloomline`)
  })
})

describe('the feed\'s secret URL', () => {
  it('shows the status but never the token', async () => {
    const url = await newFeed(p.handler2)
    expect(url).toMatch(/\/calendar\/[A-Za-z0-9_-]{43}\.ics$/)
    const status = await ok(p.handler2, '/api/calendar/feed', 'GET')
    expect(status.exists).toBe(true)
    expect(JSON.stringify(status)).not.toContain(url.split('/calendar/')[1]!.replace('.ics', ''))
    await fetchIcs(url)
    expect((await ok(p.handler2, '/api/calendar/feed', 'GET')).lastUsedAt).not.toBeNull()
  })

  it('answers 404 with no detail once revoked', async () => {
    const url = await newFeed(p.assistant2)
    expect((await fetchIcs(url)).res.status).toBe(200)
    await ok(p.assistant2, '/api/calendar/feed', 'DELETE', undefined, 200)
    const gone = await fetchIcs(url)
    expect(gone.res.status).toBe(404)
    expect(gone.text).not.toMatch(/revoked|feed/i)
    expect((await ok(p.assistant2, '/api/calendar/feed', 'GET')).exists).toBe(false)
  })

  it('stops the old URL when a new one is made', async () => {
    const old = await newFeed(p.handler)
    const replacement = await newFeed(p.handler)
    expect((await fetchIcs(old)).res.status).toBe(404)
    expect((await fetchIcs(replacement)).res.status).toBe(200)
  })

  it.each([
    ['an unknown token', `/calendar/${'A'.repeat(43)}.ics`],
    ['a malformed token', '/calendar/not-a-token.ics'],
  ])('answers 404 for %s', async (_, path) => {
    expect((await fetchIcs(path)).res.status).toBe(404)
  })
})

describe('a dog\'s plan as .ics', () => {
  it('downloads as an attachment with one event per plan step', async () => {
    const plan = await ok<PlanView>(p.handler, `/api/dogs/${made.handlersDog.id}/plan`, 'GET')
    const { res, text } = await fetchIcs(`/api/dogs/${made.handlersDog.id}/plan.ics`, p.handler)
    expect(res.status).toBe(200)
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename=".+\.ics"$/)
    expect(plan.plan.steps.length).toBeGreaterThan(0)
    expect(vevents(text)).toHaveLength(plan.plan.steps.length)
  })

  it.each([
    ['a handler, for another handler\'s dog', 'handler', 'othersDog'],
    ['another organisation', 'foreign', 'handlersDog'],
  ] as const)('is a 404 for %s', async (_, who, dog) => {
    expect((await call(p[who], `/api/dogs/${made[dog]!.id}/plan.ics`)).status).toBe(404)
  })
})
