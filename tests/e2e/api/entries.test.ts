import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, classEligibility } from '../../../shared/coat'
import type { DogView, EntryView, ShowView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, expectNo500, inDays, kennelPeople, makeDog, makeShow, ok, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let adult: DogView
let puppy: DogView
let hidden: DogView
let show: ShowView
let closed: ShowView
let foreignDog: DogView
let foreignShow: ShowView
let foreignEntry: EntryView

type Role = 'manager' | 'handler' | 'assistant'

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  adult = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: addDays(today(), -3 * 365) })
  puppy = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: addDays(today(), -200) })
  hidden = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  show = await makeShow(p.manager, 30, { entriesCloseDate: inDays(10), entriesCloseTime: '23:59' })
  closed = await makeShow(p.manager, 20, { entriesCloseDate: inDays(-1), entriesCloseTime: '12:00' })
  foreignDog = await makeDog(p.foreign)
  foreignShow = await makeShow(p.foreign, 30)
  // Northfold's rule set is FCI (seeders/accounts.ts).
  foreignEntry = await ok<EntryView>(p.foreign, '/api/entries', 'POST', { dogId: foreignDog.id, showId: foreignShow.id, classCode: 'fci:open' })
})
afterAll(() => db.end())

const enter = (fields: Record<string, unknown>) => ok<EntryView>(p.manager, '/api/entries', 'POST', { dogId: adult.id, showId: show.id, classCode: 'kc:open', ...fields })

describe('making an entry', () => {
  it('takes the dog\'s handler by default, names the class and checks its age on the first day', async () => {
    const entry = await enter({ armband: '14', status: 'entered' })
    expect(entry).toMatchObject({ classCode: 'kc:open', classLabel: 'Open', armband: '14', status: 'entered', handler: { id: p.ids.handler }, warnings: [] })
    const expected = classEligibility('KC', adult.dateOfBirth, show.firstDay).find(c => c.code === 'kc:open')
    expect(entry.eligibility).toEqual(expected)
    expect((await auditOf(db, 'entry', entry.id))[0]).toMatchObject({ action: 'create', actor_id: p.ids.manager })
  })

  // The Kennel Club (UK), Definitions of Classes: Minor Puppy is for dogs of six and not exceeding
  // nine calendar months on the first day of the show (DESIGN.md §5, from memory).
  it.each([
    ['a three-year-old in Minor Puppy is not eligible, and warned', () => adult, 'kc:minor-puppy', false],
    ['a seven-month-old in Minor Puppy is eligible', () => puppy, 'kc:minor-puppy', true],
    ['a seven-month-old in Yearling is not eligible, and warned', () => puppy, 'kc:yearling', false],
  ] as [string, () => DogView, string, boolean][])('%s', async (_, dog, classCode, eligible) => {
    const entry = await enter({ dogId: dog().id, classCode })
    expect(entry.eligibility?.eligible).toBe(eligible)
    expect(entry.eligibility).toEqual(classEligibility('KC', dog().dateOfBirth, show.firstDay).find(c => c.code === classCode))
    expect(entry.warnings.some(w => /not eligible/.test(w) && /Kennel Club/.test(w))).toBe(!eligible)
  })

  it('an entry made after entries closed carries a warning; one made before does not', async () => {
    const late = await enter({ showId: closed.id })
    expect(late.warnings.join(' ')).toMatch(/after entries closed/)
    const entries = await ok<EntryView[]>(p.manager, `/api/entries?show=${show.id}&dog=${adult.id}`, 'GET')
    expect(entries.every(e => !e.warnings.some(w => /after entries closed/.test(w)))).toBe(true)
  })

  it('the same dog in the same class at the same show is a 409 that says so', async () => {
    await enter({ classCode: 'kc:limit' })
    const res = await call(p.manager, '/api/entries', 'POST', { dogId: adult.id, showId: show.id, classCode: 'kc:limit' })
    expect(res.status).toBe(409)
    expect(res.body.message).toContain(adult.callName)
    expect(res.body.message).toMatch(/already entered in Limit/)
  })

  it.each([
    ['dogId', () => ({ dogId: foreignDog.id })],
    ['dogId', () => ({ dogId: 99999999999 })],
    ['showId', () => ({ showId: foreignShow.id })],
    ['handlerId', () => ({ handlerId: p.ids.foreign })],
    ['classCode', () => ({ classCode: 'fci:junior' })],
    ['classCode', () => ({ classCode: 'junior' })],
    ['status', () => ({ status: 'maybe' })],
    ['armband', () => ({ armband: 'x'.repeat(21) })],
  ] as [string, () => object][])('a bad %s is a 400 naming it', async (field, change) => {
    expectFieldError(await call(p.manager, '/api/entries', 'POST', { dogId: adult.id, showId: show.id, classCode: 'kc:graduate', ...change() }), field)
  })

  it.each([['handler'], ['assistant']] as [Role][])('a %s may not make entries (403)', async (role) => {
    expect((await call(p[role], '/api/entries', 'POST', { dogId: adult.id, showId: show.id, classCode: 'kc:novice' })).status).toBe(403)
  })
})

describe('who sees which entry', () => {
  let hiddenEntry: EntryView
  beforeAll(async () => {
    hiddenEntry = await enter({ dogId: hidden.id, classCode: 'kc:open' })
  })

  it('a handler lists only the entries of the dogs in their reach', async () => {
    const list = await ok<EntryView[]>(p.handler, `/api/entries?show=${show.id}`, 'GET')
    expect(list.length).toBeGreaterThan(0)
    expect(list.every(e => [adult.id, puppy.id].includes(e.dog.id))).toBe(true)
    expect((await call(p.handler, `/api/entries/${hiddenEntry.id}`)).status).toBe(404)
  })

  it('a manager lists them all, and filters by show, dog and status', async () => {
    const all = await ok<EntryView[]>(p.manager, `/api/entries?show=${show.id}`, 'GET')
    expect(all.map(e => e.dog.id)).toContain(hidden.id)
    const byDog = await ok<EntryView[]>(p.manager, `/api/entries?show=${show.id}&dog=${puppy.id}`, 'GET')
    expect(byDog.length).toBeGreaterThan(0)
    expect(byDog.every(e => e.dog.id === puppy.id)).toBe(true)
    const entered = await ok<EntryView[]>(p.manager, `/api/entries?show=${show.id}&status=entered`, 'GET')
    expect(entered.length).toBeGreaterThan(0)
    expect(entered.every(e => e.status === 'entered')).toBe(true)
  })

  it.each([['/api/entries'], ['/api/entries/ID']])('an assistant gets a 403 for %s', async (path) => {
    expect((await call(p.assistant, path.replace('ID', String(hiddenEntry.id)))).status).toBe(403)
  })

  it.each([['GET'], ['PATCH'], ['DELETE']])('%s another organisation\'s entry is a 404', async (method) => {
    expect((await call(p.manager, `/api/entries/${foreignEntry.id}`, method, method === 'PATCH' ? { armband: '2' } : undefined)).status).toBe(404)
  })

  it.each([['show=x', 'show'], ['status=gone', 'status']])('?%s is a 400 naming %s', async (query, field) => {
    expectFieldError(await call(p.manager, `/api/entries?${query}`), field)
  })
})

describe('changing and deleting an entry', () => {
  it('withdrawing is audited and the entry warns that it is withdrawn', async () => {
    const entry = await enter({ classCode: 'kc:post-graduate' })
    const withdrawn = await ok<EntryView>(p.manager, `/api/entries/${entry.id}`, 'PATCH', { status: 'withdrawn' })
    expect(withdrawn.warnings.join(' ')).toMatch(/Withdrawn/)
    const update = (await auditOf(db, 'entry', entry.id)).find(a => a.action === 'update')!
    expect([update.before.status, update.after.status]).toEqual(['planned', 'withdrawn'])
  })

  it('moving an entry onto a class the dog is already in is a 409', async () => {
    const entry = await enter({ classCode: 'kc:mid-limit' })
    await enter({ classCode: 'kc:undergraduate' })
    expect((await call(p.manager, `/api/entries/${entry.id}`, 'PATCH', { classCode: 'kc:undergraduate' })).status).toBe(409)
  })

  it.each([
    ['classCode', { classCode: 'akc:open' }],
    ['handlerId', { handlerId: 99999999999 }],
    ['(body)', {}],
  ])('a patch with a bad %s is a 400 naming it', async (field, body) => {
    const entry = (await ok<EntryView[]>(p.manager, `/api/entries?show=${show.id}`, 'GET'))[0]!
    expectFieldError(await call(p.manager, `/api/entries/${entry.id}`, 'PATCH', body), field)
  })

  it('a handler may not change or delete entries (403)', async () => {
    const entry = (await ok<EntryView[]>(p.handler, `/api/entries?show=${show.id}`, 'GET'))[0]!
    expect((await call(p.handler, `/api/entries/${entry.id}`, 'PATCH', { armband: '3' })).status).toBe(403)
    expect((await call(p.handler, `/api/entries/${entry.id}`, 'DELETE')).status).toBe(403)
  })

  it('a manager deletes one; it is gone and the deletion audited', async () => {
    const entry = await enter({ classCode: 'kc:special-beginners' })
    expect((await call(p.manager, `/api/entries/${entry.id}`, 'DELETE')).status).toBe(204)
    expect((await call(p.manager, `/api/entries/${entry.id}`)).status).toBe(404)
    expect((await auditOf(db, 'entry', entry.id)).find(a => a.action === 'delete')?.before.classCode).toBe('kc:special-beginners')
  })
})

describe('no input makes the entry routes fail', () => {
  it('POST /api/entries and PATCH /api/entries/:id answer 4xx or success, never 500', async () => {
    const fuzzShow = await makeShow(p.manager, 50)
    const valid = { dogId: adult.id, showId: fuzzShow.id, classCode: 'kc:open', armband: '9', status: 'entered', handlerId: p.ids.handler2, notes: 'n' }
    await expectNo500(p.manager, 'POST', '/api/entries', valid)
    const entry = await enter({ showId: fuzzShow.id, classCode: 'kc:veteran' })
    const { dogId: _dog, showId: _show, ...patch } = valid
    await expectNo500(p.manager, 'PATCH', `/api/entries/${entry.id}`, patch)
  })
})
