import fc from 'fast-check'
import pg from 'pg'
import { expect } from 'vitest'
import { addDays, type ISODate } from '../../../shared/coat'
import type { DogView, ShowView } from '../../../shared/types/kennel'
import type { MeView, MemberView } from '../../../shared/types/organisation'
import { request, signedIn, type CookieJar } from './http'

/** Marks this run's records, so the tests never depend on (or collide with) the demo data or another run. */
export const TAG = `T${Date.now().toString(36)}${Math.floor(Math.random() * 1e4)}`

/** Today's date in a time zone, read with Intl as the server must (DESIGN.md §2: "today" is the organisation's date). */
export function todayIn(timeZone: string): ISODate {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date())
}

/** Today at the Larkspur demo kennel, whose time zone is Europe/London (seeders/accounts.ts). */
export const today = () => todayIn('Europe/London')
export const inDays = (days: number) => addDays(today(), days)

/** A JSON call: the status and the parsed body (null when there is none). */
export async function call<T = any>(jar: CookieJar | null, path: string, method = 'GET', json?: unknown): Promise<{ status: number, body: T }> {
  const res = await request(jar, path, { method, json })
  const text = await res.text()
  return { status: res.status, body: (text ? JSON.parse(text) : null) as T }
}

/** A call that must succeed with `status` (201 unless told); the body. */
export async function ok<T = any>(jar: CookieJar, path: string, method = 'POST', json?: unknown, status = method === 'POST' ? 201 : 200): Promise<T> {
  const res = await call<T>(jar, path, method, json)
  if (res.status !== status) throw new Error(`${method} ${path} answered ${res.status}, not ${status}: ${JSON.stringify(res.body)}`)
  return res.body
}

/** Asserts a 400 that names `field` in `data.fields`, as the forms read it. */
export function expectFieldError(res: { status: number, body: any }, field: string) {
  expect(res.status, JSON.stringify(res.body)).toBe(400)
  expect(Object.keys(res.body.data?.fields ?? {})).toContain(field)
}

/** Signed-in sessions for the demo people the kennel tests use, and their user ids. */
export async function kennelPeople() {
  const [manager, handler, handler2, assistant, assistant2, foreign] = await Promise.all([
    signedIn('maren@larkspur.example'),
    signedIn('tobias@larkspur.example'),
    signedIn('ines@larkspur.example'),
    signedIn('pip@larkspur.example'),
    signedIn('juno@larkspur.example'),
    signedIn('corrie@northfold.example'),
  ])
  const members = await ok<MemberView[]>(manager, '/api/members', 'GET')
  const idOf = (email: string) => members.find(m => m.email === email)!.userId
  const me = await ok<MeView>(manager, '/api/me', 'GET')
  const foreignMe = await ok<MeView>(foreign, '/api/me', 'GET')
  return {
    manager, handler, handler2, assistant, assistant2, foreign,
    organisationId: me.organisation!.id,
    foreignOrganisationId: foreignMe.organisation!.id,
    ids: {
      manager: idOf('maren@larkspur.example'),
      handler: idOf('tobias@larkspur.example'),
      handler2: idOf('ines@larkspur.example'),
      assistant: idOf('pip@larkspur.example'),
      assistant2: idOf('juno@larkspur.example'),
      foreign: foreignMe.user.id,
    },
  }
}
export type KennelPeople = Awaited<ReturnType<typeof kennelPeople>>

let serial = 0
/** A new dog through the API (a manager's session); `fields` override the invented defaults. */
export function makeDog(jar: CookieJar, fields: Record<string, unknown> = {}): Promise<DogView> {
  serial++
  return ok<DogView>(jar, '/api/dogs', 'POST', {
    callName: `${TAG} Dog ${serial}`,
    registeredName: `Fernwhistle ${TAG} Number ${serial}`,
    breed: 'Ashgrove Wire Terrier',
    sex: serial % 2 ? 'dog' : 'bitch',
    dateOfBirth: addDays(today(), -3 * 365),
    ...fields,
  })
}

/** A new show through the API (a manager's session), `days` from today. */
export function makeShow(jar: CookieJar, days: number, fields: Record<string, unknown> = {}): Promise<ShowView> {
  serial++
  return ok<ShowView>(jar, '/api/shows', 'POST', {
    name: `${TAG} Show ${serial}`,
    firstDay: inDays(days),
    lastDay: inDays(days),
    ...fields,
  })
}

/** Logs coat work on a dog (any signed-in role that may), `days` from today (negative: in the past). */
export function logWork(jar: CookieJar, dogId: number, days: number, kind: string, regions: string[], fields: Record<string, unknown> = {}) {
  return ok(jar, `/api/dogs/${dogId}/work`, 'POST', { date: inDays(days), kind, regions, ...fields })
}

/** A direct connection to the test database, for what the API does not offer yet (tasks) and for reading the audit trail. */
export function database() {
  return new pg.Client({ connectionString: process.env.DATABASE_URL })
}

/**
 * Puts a dog on an assistant's tasks straight into the database: the tasks API belongs to a later
 * issue, and assistants reach exactly the dogs on their tasks (DESIGN.md §2).
 */
export async function giveTask(db: pg.Client, organisationId: number, dogId: number, assigneeId: number, status = 'open', dueDate = today()) {
  await db.query(
    `INSERT INTO tasks (organisation_id, dog_id, kind, regions, due_date, assignee_id, status, created_at, updated_at)
     VALUES ($1, $2, 'layer', ARRAY['neck'], $3, $4, $5, now(), now())`,
    [organisationId, dogId, dueDate, assigneeId, status],
  )
}

/** The audit rows of one record, oldest first. */
export async function auditOf(db: pg.Client, entity: string, entityId: number) {
  const { rows } = await db.query('SELECT * FROM audit_events WHERE entity = $1 AND entity_id = $2 ORDER BY id', [entity, entityId])
  return rows as { action: string, actor_id: number, before: any, after: any }[]
}

/**
 * Sends `valid` with one field swapped for an arbitrary JSON value, or an arbitrary body, many
 * times, and asserts the route never answers 500: a bad input is always the caller's 4xx.
 */
export async function expectNo500(jar: CookieJar, method: string, path: string, valid: Record<string, unknown>, runs = 40) {
  const keys = [...Object.keys(valid), 'unexpected']
  const bodies = fc.oneof(
    fc.tuple(fc.constantFrom(...keys), fc.jsonValue()).map(([key, value]) => ({ ...valid, [key]: value })),
    fc.jsonValue(),
  )
  await fc.assert(fc.asyncProperty(bodies, async (body) => {
    const res = await call(jar, path, method, body)
    expect(res.status, `${method} ${path} ${JSON.stringify(body)}`).toBeLessThan(500)
  }), { numRuns: runs })
}
