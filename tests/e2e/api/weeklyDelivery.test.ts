import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeSequelize } from '../../../server/database/connection'
import { sendJob, stopJobs } from '../../../server/utils/jobs'
import type { DogSummary } from '../../../shared/types/kennel'
import type { TaskView } from '../../../shared/types/tasks'
import type { WeeklyPreviewView, WeeklyRecipientsView, WeeklySendResult } from '../../../shared/types/weekly'
import { addIsoWeeks, isoWeekMonday, isoWeekNumber } from '../../../shared/weekly'
import { request, signedIn, type CookieJar } from '../helpers/http'
import { signedInAt, startInstance } from '../helpers/instance'
import { startSmtp, type ReceivedMail } from '../helpers/smtp'
import { cloneDemo, weeklyBackOn, weeklyOnlyFor, type ClonePerson, type DemoClone } from '../helpers/weeklyOrg'

// The weekly status end to end, over a real SMTP server on loopback (smtp-server, parsed with
// mailparser). Each part works on its own copy of the invented demo kennel (seeders/), so no
// other test's mail, and no earlier run of this week, can stand in for the message it waits for.

const TICK = 'weekly-status-tick'
const run = Date.now().toString(36)
let smtp: Awaited<ReturnType<typeof startSmtp>>
let db: pg.Client

beforeAll(async () => {
  smtp = await startSmtp()
  db = new pg.Client({ connectionString: process.env.DATABASE_URL })
  await db.connect()
})

afterAll(async () => {
  await stopJobs()
  await closeSequelize()
  await db.end()
  await smtp.stop()
})

async function until<T>(what: () => Promise<T> | T, ok: (value: T) => boolean, timeoutMs = 45_000): Promise<T> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const value = await what()
    if (ok(value)) return value
    if (Date.now() > deadline) throw new Error(`Timed out; last value ${JSON.stringify(value).slice(0, 2000)}`)
    await new Promise(r => setTimeout(r, 250))
  }
}

const settle = (ms = 4000) => new Promise(r => setTimeout(r, ms))

/** The weekly status messages of an ISO week from an organisation that reached a person. */
function weeklyTo(person: ClonePerson, week: string, organisationName: string): ReceivedMail[] {
  return smtp.to(person.email).filter(m => m.parsed.subject?.startsWith(`Week ${isoWeekNumber(week)} at ${organisationName}: `))
}

async function outboxRows(organisationId: number, week: string) {
  const { rows } = await db.query(
    `SELECT id, recipient_email AS email, status, attempts, last_error AS "lastError", message_id AS "messageId"
     FROM mail_outbox WHERE organisation_id = $1 AND kind = 'weekly_status' AND period_key = $2 ORDER BY id`, [organisationId, week])
  return rows as { id: number, email: string, status: string, attempts: number, lastError: string | null, messageId: string }[]
}

async function json<T>(jar: CookieJar, path: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const res = await request(jar, path, init)
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`)
  return await res.json() as T
}

/** The header block of a raw message, folded lines joined (RFC 5322 §2.2.3). */
function headerBlock(mail: ReceivedMail): string {
  return mail.raw.split(/\r?\n\r?\n/)[0]!.replace(/\r?\n[ \t]+/g, ' ')
}

/** The lines of a section of the text part, between its underlined heading and the next. */
function textSection(text: string, heading: string): string[] {
  const lines = text.replace(/\r\n/g, '\n').split('\n')
  const start = lines.indexOf(heading.toUpperCase())
  if (start < 0) return []
  const out: string[] = []
  for (let i = start + 2; i < lines.length; i++) {
    if (/^-+$/.test(lines[i + 1] ?? '') && lines[i] === lines[i]!.toUpperCase() && lines[i]!.trim()) break
    out.push(lines[i]!)
  }
  return out
}

/** The dogs the text part lists, in its order, with the readiness it gives each. */
function dogsInText(text: string): { name: string, readiness: string }[] {
  const section = textSection(text, 'Dogs by their next show')
  const listed = section.filter(l => l.startsWith('- ')).map((l) => {
    const name = l.slice(2, l.indexOf(' ('))
    return { name, readiness: l.slice(l.lastIndexOf('): ') + 3) }
  })
  const unentered = section.find(l => l.startsWith('Not entered in a show: '))
  for (const name of unentered?.slice('Not entered in a show: '.length).split(', ') ?? []) listed.push({ name, readiness: 'no show ahead' })
  return listed
}

const word = (name: string) => new RegExp(`\\b${name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\b`)

async function currentWeek(manager: CookieJar): Promise<string> {
  return (await json<WeeklyRecipientsView>(manager, '/api/weekly/recipients')).week
}

describe('the weekly status for a handler', () => {
  let clone: DemoClone
  let manager: CookieJar
  let week: string
  let preview: WeeklyPreviewView

  beforeAll(async () => {
    clone = await cloneDemo(`wd-a-${run}`)
    manager = await signedIn(clone.person('manager'))
    week = await currentWeek(manager)
    preview = await json<WeeklyPreviewView>(manager, `/api/weekly/preview?userId=${clone.person('tobias@larkspur.example').userId}`)
    // What the cron does each minute, for this organisation only.
    await sendJob(TICK, { organisationId: clone.kennelId })
    const people = [clone.person('manager'), clone.person('tobias@larkspur.example'), clone.person('ines@larkspur.example')]
    await smtp.waitFor(() => people.every(p => weeklyTo(p, week, clone.kennelName).length > 0))
  })

  it('holds exactly the dogs the API lets that handler see, with the same readiness', async () => {
    const person = clone.person('tobias@larkspur.example')
    const jar = await signedIn(person)
    const [mine, everyDog, tasks] = await Promise.all([
      json<DogSummary[]>(jar, '/api/dogs'),
      json<DogSummary[]>(manager, '/api/dogs?status=all'),
      json<TaskView[]>(jar, '/api/tasks'),
    ])
    // The demo gives this handler some of the kennel's dogs and not others (seeders/kennel.ts).
    expect(mine.length).toBeGreaterThan(3)
    expect(mine.length).toBeLessThan(everyDog.length - 3)

    const [mail] = weeklyTo(person, week, clone.kennelName)
    const text = mail!.parsed.text!
    const listed = dogsInText(text)
    expect(listed.map(d => d.name).sort()).toEqual(mine.map(d => d.callName).sort())
    for (const dog of mine) {
      const shown = listed.find(d => d.name === dog.callName)!
      expect(shown.readiness, dog.callName).toBe(dog.readiness ? `${dog.readiness.score}, ${dog.readiness.onTrack ? 'on track' : 'not on track'}` : 'no show ahead')
    }

    // No dog outside the handler's reach appears anywhere in the message, in either part.
    const reach = new Set([...mine.map(d => d.callName), ...tasks.map(t => t.dog.callName)])
    const others = everyDog.filter(d => !reach.has(d.callName))
    expect(others.length).toBeGreaterThan(3)
    for (const dog of others) {
      expect(text, dog.callName).not.toMatch(word(dog.callName))
      expect(mail!.parsed.html, dog.callName).not.toMatch(word(dog.callName))
    }
  })

  it('a manager\'s holds every active dog of the kennel', async () => {
    const everyActive = await json<DogSummary[]>(manager, '/api/dogs')
    const [mail] = weeklyTo(clone.person('manager'), week, clone.kennelName)
    expect(dogsInText(mail!.parsed.text!).map(d => d.name).sort()).toEqual(everyActive.map(d => d.callName).sort())
  })

  it('is exactly what the preview showed, with one Date, one From, a Message-ID and both parts (RFC 5322 §3.6)', async () => {
    const person = clone.person('tobias@larkspur.example')
    const mails = weeklyTo(person, week, clone.kennelName)
    expect(mails).toHaveLength(1)
    const mail = mails[0]!
    const head = headerBlock(mail)
    // RFC 5322 §3.6: exactly one origination date and one originator field; §3.6.4: a Message-ID.
    expect(head.match(/^Date:/gim)).toHaveLength(1)
    expect(head.match(/^From:/gim)).toHaveLength(1)
    expect(head.match(/^Message-ID:/gim)).toHaveLength(1)
    const row = (await outboxRows(clone.kennelId, week)).find(r => r.email === person.email)!
    expect(row.status).toBe('sent')
    expect(mail.parsed.messageId).toBe(row.messageId)
    // RFC 2046 §5.1.4: multipart/alternative, the same message as plain text and as HTML.
    expect(mail.parsed.headers.get('content-type')).toMatchObject({ value: 'multipart/alternative' })
    expect(mail.parsed.subject).toBe(preview.subject)
    expect(String(mail.parsed.html).replace(/\r\n/g, '\n')).toBe(preview.html)
    expect(mail.parsed.text!.replace(/\r\n/g, '\n').trimEnd()).toBe(preview.text.trimEnd())
    expect(mail.parsed.html).not.toMatch(/<img|<link|<script/i)
    // RFC 8058 §3.1: an HTTPS (here the test's HTTP) URI in angle brackets, and the one-click key.
    expect(head).toMatch(/^List-Unsubscribe: <http:\/\/[^>]+\/api\/public\/unsubscribe\/\d+-\d+-[\w-]{43}>$/im)
    expect(head).toMatch(/^List-Unsubscribe-Post: List-Unsubscribe=One-Click$/im)
    expect(mail.parsed.text).toContain(`/unsubscribe/`)
  })

  it('goes to managers and handlers, not to assistants while the organisation does not send to them', async () => {
    const rows = await outboxRows(clone.kennelId, week)
    expect(rows.map(r => r.email).sort()).toEqual([clone.person('manager').email, clone.person('tobias@larkspur.example').email, clone.person('ines@larkspur.example').email].sort())
    expect(weeklyTo(clone.person('assistant'), week, clone.kennelName)).toHaveLength(0)
  })
})

describe('with the SMTP server stopped', () => {
  let clone: DemoClone
  let manager: CookieJar
  let week: string

  beforeAll(async () => {
    clone = await cloneDemo(`wd-c-${run}`)
    manager = await signedIn(clone.person('manager'))
    week = await currentWeek(manager)
  })

  it('nothing is lost: the messages wait, are tried again, and arrive once each when it is back', async () => {
    const people = [clone.person('manager'), clone.person('tobias@larkspur.example'), clone.person('ines@larkspur.example')]
    await smtp.stop()
    try {
      const sent = await json<WeeklySendResult>(manager, '/api/weekly/send-now', { method: 'POST', json: {} })
      expect(sent.results.filter(r => r.outcome === 'queued').map(r => r.email).sort()).toEqual(people.map(p => p.email).sort())
      // Every message has been tried and failed, and waits for the next try.
      const waiting = await until(() => outboxRows(clone.kennelId, week), rows => rows.length === 3 && rows.every(r => r.status === 'pending' && r.attempts >= 2))
      for (const row of waiting) expect(row.lastError).toMatch(/ECONNREFUSED|connect/i)
      // The weekly page's list says so too.
      const listed = await until(() => json<WeeklyRecipientsView>(manager, '/api/weekly/recipients'),
        view => people.every(p => view.recipients.find(r => r.userId === p.userId)?.state === 'pending'))
      for (const p of people) expect(listed.recipients.find(r => r.userId === p.userId)!.delivery!.lastError).toMatch(/ECONNREFUSED|connect/i)
      // A scheduled run meanwhile queues nothing more: this week's messages are already there.
      await sendJob(TICK, { organisationId: clone.kennelId })
      await settle(3000)
      expect(await outboxRows(clone.kennelId, week)).toHaveLength(3)
    }
    finally {
      await smtp.start()
    }
    await smtp.waitFor(() => people.every(p => weeklyTo(p, week, clone.kennelName).length > 0), 60_000)
    await settle()
    for (const p of people) expect(weeklyTo(p, week, clone.kennelName), p.email).toHaveLength(1)
    expect((await outboxRows(clone.kennelId, week)).map(r => r.status)).toEqual(['sent', 'sent', 'sent'])
  })

  it('one click on the List-Unsubscribe address stops the next week\'s message (RFC 8058)', async () => {
    const ines = clone.person('ines@larkspur.example')
    const [mail] = weeklyTo(ines, week, clone.kennelName)
    const address = /^List-Unsubscribe: <([^>]+)>$/im.exec(headerBlock(mail!))![1]!
    // RFC 8058 §3.2: the mail client POSTs "List-Unsubscribe=One-Click", with no cookie or other state.
    const res = await fetch(address, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'List-Unsubscribe=One-Click' })
    expect(res.status).toBe(200)
    expect(await res.json()).toMatchObject({ email: ines.email, organisationName: clone.kennelName, unsubscribed: true })

    const next = addIsoWeeks(week, 1)
    const listed = await json<WeeklyRecipientsView>(manager, `/api/weekly/recipients?week=${next}`)
    expect(listed.recipients.find(r => r.userId === ines.userId)).toMatchObject({ unsubscribed: true, receives: false, state: 'unsubscribed' })

    // The scheduled run of next week, on Monday at noon UTC (the copy sends from Monday 00:00 London time).
    await sendJob(TICK, { organisationId: clone.kennelId, at: `${isoWeekMonday(next)}T12:00:00Z` })
    const others = [clone.person('manager'), clone.person('tobias@larkspur.example')]
    await smtp.waitFor(() => others.every(p => weeklyTo(p, next, clone.kennelName).length > 0))
    await settle()
    expect(weeklyTo(ines, next, clone.kennelName)).toHaveLength(0)
    expect((await outboxRows(clone.kennelId, next)).map(r => r.email).sort()).toEqual(others.map(p => p.email).sort())
    // This week's message stays the one she had.
    expect(weeklyTo(ines, week, clone.kennelName)).toHaveLength(1)

    // The same link undoes it.
    const undo = await fetch(address, { method: 'DELETE' })
    expect(await undo.json()).toMatchObject({ unsubscribed: false })
    const after = await json<WeeklyRecipientsView>(manager, `/api/weekly/recipients?week=${addIsoWeeks(week, 2)}`)
    expect(after.recipients.find(r => r.userId === ines.userId)).toMatchObject({ unsubscribed: false, receives: true, state: 'not-yet' })
  })
})

describe('two workers and a restart during a scheduled run', () => {
  it('send exactly one weekly status per recipient and week', { timeout: 240_000 }, async () => {
    const clone = await cloneDemo(`wd-b-${run}`, { toAssistants: true })
    const manager = await signedIn(clone.person('manager'))
    const week = await currentWeek(manager)
    // Everyone of the kennel and of the club copy: managers, handlers and (turned on) assistants;
    // one of them is in both, and gets one message from each.
    const kennel = ['manager', 'tobias@larkspur.example', 'ines@larkspur.example', 'pip@larkspur.example', 'juno@larkspur.example'].map(p => ({ person: clone.person(p), organisation: clone.kennelName }))
    const club = ['corrie@northfold.example', 'maren@larkspur.example'].map(p => ({ person: clone.person(p), organisation: clone.clubName }))
    const recipients = [...kennel, ...club]
    const base = Number(process.env.BLOOMLINE_TEST_PORT)
    // The other organisations are left out of this run, so it is about this copy's mail alone.
    const off = await weeklyOnlyFor([clone.kennelId, clone.clubId])
    // A slow server, so messages are on the wire when an instance is killed.
    smtp.behaviour.delayMs = 1500
    // Two more instances against the same database, each firing the cron (BLOOMLINE_SCHEDULE unset).
    const cron = { BLOOMLINE_SCHEDULE: undefined }
    let first = await startInstance(base + 1, cron)
    const second = await startInstance(base + 2, cron)
    try {
      // The cron's first tick queues the week for everyone; kill the first instance as soon as
      // messages are being sent.
      const rows = () => Promise.all([outboxRows(clone.kennelId, week), outboxRows(clone.clubId, week)]).then(([a, b]) => [...a, ...b])
      await until(rows, r => r.length === recipients.length && r.some(x => x.status === 'sending'), 90_000)
      await first.stop('SIGKILL')
      const killedAt = new Date()
      expect((await rows()).some(r => r.status !== 'sent')).toBe(true)
      first = await startInstance(base + 1, cron)

      // "Send now" on both instances at the same moment: the week is already queued, so nothing new.
      const jars = await Promise.all([first.url, second.url].map(url => signedInAt(url, clone.person('manager'))))
      const raced = await Promise.all([first.url, second.url].map(async (url, i) => {
        const res = await fetch(`${url}/api/weekly/send-now`, { method: 'POST', headers: { 'content-type': 'application/json', 'cookie': jars[i]!.header() }, body: '{}' })
        return { status: res.status, body: await res.text() }
      }))
      for (const { status, body } of raced) {
        expect(status, body).toBe(200)
        expect((JSON.parse(body) as WeeklySendResult).queued).toBe(0)
      }

      await smtp.waitFor(() => recipients.every(r => weeklyTo(r.person, week, r.organisation).length > 0), 90_000)
      // The next tick the cron fires after the restart finds the week done; then wait a while longer.
      await until(async () => (await db.query(`SELECT count(*)::int AS n FROM pgboss.job WHERE name = $1 AND state = 'completed' AND created_on > $2`, [TICK, killedAt])).rows[0].n as number, n => n >= 1, 90_000)
      await settle(8000)
      for (const r of recipients) expect(weeklyTo(r.person, week, r.organisation), `${r.person.email} from ${r.organisation}`).toHaveLength(1)
      const final = await rows()
      expect(final).toHaveLength(recipients.length)
      expect(final.every(r => r.status === 'sent')).toBe(true)
      // Each message's Message-ID is the one stored for it: a send tried again keeps its identity.
      const stored = new Set(final.map(r => r.messageId))
      for (const r of recipients) expect(stored.has(weeklyTo(r.person, week, r.organisation)[0]!.parsed.messageId!)).toBe(true)
    }
    finally {
      smtp.behaviour.delayMs = 0
      await Promise.all([first.stop(), second.stop()])
      await weeklyBackOn(off)
    }
  })
})
