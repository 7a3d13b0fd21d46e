import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DogView, ShowView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, expectNo500, inDays, kennelPeople, makeDog, makeShow, ok, TAG, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let handlersShow: ShowView
let otherShow: ShowView
let pastShow: ShowView
let foreignShow: ShowView
let dog: DogView

let serial = 0
const showBody = (fields: Record<string, unknown> = {}) => ({ name: `${TAG} Fixture ${++serial}`, firstDay: '2030-07-06', lastDay: '2030-07-07', ...fields })

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  dog = await makeDog(p.manager, { handlerId: p.ids.handler })
  handlersShow = await makeShow(p.manager, 40, { club: 'Thornbury Terrier Circle', place: 'Hollin Field', judges: ['Avery Quillfeather'] })
  otherShow = await makeShow(p.manager, 45)
  pastShow = await makeShow(p.manager, -10)
  foreignShow = await makeShow(p.foreign, 40)
  await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: handlersShow.id, classCode: 'kc:open' })
  await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: pastShow.id, classCode: 'kc:open' })
})
afterAll(() => db.end())

describe('entries close on the show\'s own wall clock', () => {
  // UK summer time (UTC+1) runs from the last Sunday of March to the last Sunday of October, and
  // US Eastern standard time is UTC-5 (IANA tz database; from memory). The doubled hour keeps
  // its first occurrence, Bloomline's rule in docs/api.md.
  it.each([
    ['Europe/London in summer', 'Europe/London', '2030-07-01', '23:59', '2030-07-01T22:59:00.000Z'],
    ['Europe/London in winter', 'Europe/London', '2030-01-15', '12:00', '2030-01-15T12:00:00.000Z'],
    ['America/New_York in winter', 'America/New_York', '2030-01-15', '18:00', '2030-01-15T23:00:00.000Z'],
    ['the doubled hour as clocks go back in London', 'Europe/London', '2030-10-27', '01:30', '2030-10-27T00:30:00.000Z'],
  ])('%s', async (_, timeZone, date, time, utc) => {
    const show = await ok<ShowView>(p.manager, '/api/shows', 'POST', showBody({ firstDay: '2030-11-02', lastDay: '2030-11-02', timeZone, entriesCloseDate: date, entriesCloseTime: time }))
    expect(show).toMatchObject({ timeZone, entriesCloseAt: utc, entriesClose: { date, time } })
  })

  it('the organisation\'s time zone is the default', async () => {
    const show = await ok<ShowView>(p.manager, '/api/shows', 'POST', showBody({ entriesCloseDate: '2030-06-20', entriesCloseTime: '20:00' }))
    expect(show.timeZone).toBe('Europe/London')
    expect(show.entriesCloseAt).toBe('2030-06-20T19:00:00.000Z')
  })

  it('changing only the time zone keeps the wall-clock close; null clears it; both are audited', async () => {
    const show = await ok<ShowView>(p.manager, '/api/shows', 'POST', showBody({ entriesCloseDate: '2030-07-01', entriesCloseTime: '23:59' }))
    const moved = await ok<ShowView>(p.manager, `/api/shows/${show.id}`, 'PATCH', { timeZone: 'America/New_York' })
    // US Eastern daylight time is UTC-4 in July (from memory).
    expect(moved).toMatchObject({ entriesClose: { date: '2030-07-01', time: '23:59' }, entriesCloseAt: '2030-07-02T03:59:00.000Z' })
    const cleared = await ok<ShowView>(p.manager, `/api/shows/${show.id}`, 'PATCH', { entriesCloseDate: null })
    expect([cleared.entriesClose, cleared.entriesCloseAt]).toEqual([null, null])
    const updates = (await auditOf(db, 'show', show.id)).filter(a => a.action === 'update')
    expect(updates.map(u => u.after.timeZone)).toEqual(['America/New_York', 'America/New_York'])
    expect(updates[1]!.before.entriesCloseAt).toBe('2030-07-02T03:59:00.000Z')
  })
})

describe('validation', () => {
  it.each([
    ['name', { name: '' }],
    ['lastDay', { lastDay: '2030-07-05' }],
    ['firstDay', { firstDay: '2030-02-30' }],
    ['entriesCloseDate', { entriesCloseDate: '2030-07-10', entriesCloseTime: '12:00' }],
    ['entriesCloseTime', { entriesCloseDate: '2030-07-01' }],
    ['entriesCloseDate', { entriesCloseTime: '12:00' }],
    ['entriesCloseTime', { entriesCloseDate: '2030-07-01', entriesCloseTime: '24:00' }],
    ['timeZone', { timeZone: 'Mars/Olympus_Mons' }],
    ['judges.0', { judges: [''] }],
  ])('a bad %s is a 400 naming it', async (field, change) => {
    expectFieldError(await call(p.manager, '/api/shows', 'POST', showBody(change)), field)
  })

  it('a second show of the same name on the same first day is a 409', async () => {
    const body = showBody()
    await ok(p.manager, '/api/shows', 'POST', body)
    const res = await call(p.manager, '/api/shows', 'POST', { ...body, name: body.name.toUpperCase() })
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/already a show/)
  })

  it.each([
    ['lastDay', { lastDay: '2000-01-01' }],
    ['(body)', {}],
    ['entriesCloseTime', { entriesCloseDate: inDays(1) }],
  ])('a patch with a bad %s is a 400 naming it', async (field, body) => {
    expectFieldError(await call(p.manager, `/api/shows/${otherShow.id}`, 'PATCH', body), field)
  })

  it.each([['past=maybe', 'past'], ['from=2030-13-01', 'from']])('?%s is a 400 naming %s', async (query, field) => {
    expectFieldError(await call(p.manager, `/api/shows?${query}`), field)
  })
})

describe('who sees which show', () => {
  const ids = (shows: ShowView[]) => shows.map(s => s.id)

  it('a manager lists every upcoming show, soonest first', async () => {
    const list = await ok<ShowView[]>(p.manager, '/api/shows', 'GET')
    expect(ids(list)).toEqual(expect.arrayContaining([handlersShow.id, otherShow.id]))
    expect(ids(list)).not.toContain(pastShow.id)
    expect(list.map(s => s.firstDay)).toEqual([...list.map(s => s.firstDay)].sort())
  })

  it('a handler lists only the shows their dogs are entered in, with those entries counted', async () => {
    const list = await ok<ShowView[]>(p.handler, '/api/shows', 'GET')
    expect(ids(list)).toContain(handlersShow.id)
    expect(ids(list)).not.toContain(otherShow.id)
    expect(list.find(s => s.id === handlersShow.id)!.entryCount).toBe(1)
    expect((await call(p.handler, `/api/shows/${otherShow.id}`)).status).toBe(404)
  })

  it('?past=true lists the shows that are over, latest first; from/to bound the first day', async () => {
    const past = await ok<ShowView[]>(p.handler, '/api/shows?past=true', 'GET')
    expect(ids(past)).toContain(pastShow.id)
    expect(ids(past)).not.toContain(handlersShow.id)
    const window = await ok<ShowView[]>(p.manager, `/api/shows?from=${inDays(41)}&to=${inDays(50)}`, 'GET')
    expect(ids(window)).toContain(otherShow.id)
    expect(ids(window)).not.toContain(handlersShow.id)
  })

  it('a show comes back with everything it was given', async () => {
    const view = await ok<ShowView>(p.manager, `/api/shows/${handlersShow.id}`, 'GET')
    expect(view).toMatchObject({ club: 'Thornbury Terrier Circle', place: 'Hollin Field', judges: ['Avery Quillfeather'], entryCount: 1 })
  })

  it.each([
    ['GET', '/api/shows'], ['GET', '/api/shows/ID'], ['POST', '/api/shows'], ['PATCH', '/api/shows/ID'], ['DELETE', '/api/shows/ID'],
  ])('an assistant gets a 403 for %s %s', async (method, path) => {
    const res = await call(p.assistant, path.replace('ID', String(handlersShow.id)), method, method === 'GET' || method === 'DELETE' ? undefined : showBody())
    expect(res.status).toBe(403)
  })

  it.each([['POST', '/api/shows'], ['PATCH', '/api/shows/ID'], ['DELETE', '/api/shows/ID']])('a handler gets a 403 for %s %s', async (method, path) => {
    const res = await call(p.handler, path.replace('ID', String(handlersShow.id)), method, method === 'DELETE' ? undefined : showBody())
    expect(res.status).toBe(403)
  })

  it.each([['GET'], ['PATCH'], ['DELETE']])('%s another organisation\'s show is a 404', async (method) => {
    expect((await call(p.manager, `/api/shows/${foreignShow.id}`, method, method === 'PATCH' ? { notes: 'x' } : undefined)).status).toBe(404)
  })

  it('without a session the show list is a 401', async () => {
    expect((await call(null, '/api/shows')).status).toBe(401)
  })
})

describe('deleting a show', () => {
  it('a show with entries is kept (409); one without is deleted and audited', async () => {
    expect((await call(p.manager, `/api/shows/${handlersShow.id}`, 'DELETE')).status).toBe(409)
    const empty = await makeShow(p.manager, 70)
    expect((await call(p.manager, `/api/shows/${empty.id}`, 'DELETE')).status).toBe(204)
    expect((await call(p.manager, `/api/shows/${empty.id}`)).status).toBe(404)
    const deletion = (await auditOf(db, 'show', empty.id)).find(a => a.action === 'delete')!
    expect(deletion.before.name).toBe(empty.name)
  })
})

describe('no input makes the show routes fail', () => {
  it('POST /api/shows and PATCH /api/shows/:id answer 4xx or success, never 500', async () => {
    const valid = showBody({ club: 'c', place: 'p', judges: ['j'], timeZone: 'Europe/Dublin', entriesCloseDate: '2030-06-01', entriesCloseTime: '09:30', notes: 'n' })
    await expectNo500(p.manager, 'POST', '/api/shows', valid)
    const show = await makeShow(p.manager, 80)
    await expectNo500(p.manager, 'PATCH', `/api/shows/${show.id}`, valid)
  })
})
