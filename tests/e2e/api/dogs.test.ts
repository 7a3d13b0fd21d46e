import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assessDog, COAT_CAUTIONS, planWorkBack, type CoatWork } from '../../../shared/coat'
import type { AuditEventView, DogSummary, DogView, PlanView, ProfileView, ReadinessView, ShowView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, expectNo500, giveTask, inDays, kennelPeople, logWork, makeDog, makeShow, ok, TAG, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
const dogs: Record<string, DogView> = {}
let show: ShowView
let foreignDog: DogView
let foreignShow: ShowView
let profile: ProfileView

type Role = 'manager' | 'handler' | 'assistant'

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  const owner = { ownerName: 'Odile Brackenridge', ownerEmail: 'odile@owners.example', ownerPhone: '+44 1632 960001' }
  dogs.handled = await makeDog(p.manager, { handlerId: p.ids.handler, ...owner })
  dogs.entryNamesHandler = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  dogs.otherHandler = await makeDog(p.manager, { handlerId: p.ids.handler2, breed: 'Rookmoor Broken-coat' })
  dogs.openTask = await makeDog(p.manager, { handlerId: p.ids.handler2, ...owner })
  dogs.recentDoneTask = await makeDog(p.manager)
  dogs.oldDoneTask = await makeDog(p.manager)
  dogs.retired = await makeDog(p.manager, { status: 'retired' })
  show = await makeShow(p.manager, 60)
  await ok(p.manager, '/api/entries', 'POST', { dogId: dogs.entryNamesHandler.id, showId: show.id, classCode: 'kc:open', handlerId: p.ids.handler })
  // DESIGN.md §2: open tasks, and done or skipped ones due in the last 14 days, put a dog in an assistant's reach.
  await giveTask(db, p.organisationId, dogs.openTask.id, p.ids.assistant, 'open')
  await giveTask(db, p.organisationId, dogs.recentDoneTask.id, p.ids.assistant, 'done', inDays(-10))
  await giveTask(db, p.organisationId, dogs.oldDoneTask.id, p.ids.assistant, 'skipped', inDays(-20))
  foreignDog = await makeDog(p.foreign)
  foreignShow = await makeShow(p.foreign, 30)
  profile = await ok<ProfileView>(p.manager, `/api/profiles/${dogs.handled.coatProfileId}`, 'GET')
})
afterAll(() => db.end())

const jarOf = (role: Role) => p[role]

describe('who sees which dog', () => {
  it.each([
    ['manager', ['handled', 'entryNamesHandler', 'otherHandler', 'openTask', 'recentDoneTask', 'oldDoneTask']],
    ['handler', ['handled', 'entryNamesHandler']],
    ['assistant', ['openTask', 'recentDoneTask']],
  ] as [Role, string[]][])('the %s lists exactly the dogs in their reach', async (role, expected) => {
    const listed = await ok<DogSummary[]>(jarOf(role), `/api/dogs?search=${TAG}`, 'GET')
    const ours = Object.entries(dogs).filter(([, d]) => listed.some(l => l.id === d.id)).map(([name]) => name)
    expect(ours.sort()).toEqual([...expected].sort())
  })

  it.each([
    ['manager', 'otherHandler', 200],
    ['handler', 'handled', 200],
    ['handler', 'entryNamesHandler', 200],
    ['handler', 'otherHandler', 404],
    ['handler', 'openTask', 404],
    ['assistant', 'openTask', 200],
    ['assistant', 'oldDoneTask', 404],
    ['assistant', 'handled', 404],
  ] as [Role, string, number][])('the %s opening the %s dog gets %i', async (role, name, status) => {
    expect((await call(jarOf(role), `/api/dogs/${dogs[name]!.id}`)).status).toBe(status)
  })

  it('every dog a handler lists is theirs or has an entry naming them', async () => {
    const listed = await ok<DogSummary[]>(p.handler, '/api/dogs?status=all', 'GET')
    const { rows } = await db.query(
      'SELECT d.id FROM dogs d WHERE d.id = ANY($1) AND d.handler_id IS DISTINCT FROM $2 AND NOT EXISTS (SELECT 1 FROM entries e WHERE e.dog_id = d.id AND e.handler_id = $2)',
      [listed.map(d => d.id), p.ids.handler])
    expect(rows).toEqual([])
  })

  it.each([
    ['manager', true],
    ['handler', true],
    ['assistant', false],
  ] as [Role, boolean][])('the %s sees owner contact: %s', async (role, sees) => {
    const dog = role === 'assistant' ? dogs.openTask! : dogs.handled!
    const view = await ok<DogView>(jarOf(role), `/api/dogs/${dog.id}`, 'GET')
    if (sees) expect(view.owner).toEqual({ name: 'Odile Brackenridge', email: 'odile@owners.example', phone: '+44 1632 960001' })
    else expect(view.owner).toBeNull()
    expect(view.can.seeEntries).toBe(sees)
  })

  it('an assistant may not filter dogs by show (that would show entries)', async () => {
    expect((await call(p.assistant, `/api/dogs?show=${show.id}`)).status).toBe(403)
  })

  it.each([
    ['GET', ''], ['PATCH', ''], ['DELETE', ''], ['GET', '/work'], ['POST', '/work'], ['GET', '/readiness'], ['GET', '/plan'], ['GET', '/history'],
  ])('%s another organisation\'s dog%s is a 404', async (method, suffix) => {
    const body = method === 'PATCH' ? { notes: 'x' } : method === 'POST' ? { date: today(), kind: 'layer', regions: ['neck'] } : undefined
    expect((await call(p.manager, `/api/dogs/${foreignDog.id}${suffix}`, method, body)).status).toBe(404)
  })

  it('without a session the dog list is a 401', async () => {
    expect((await call(null, '/api/dogs')).status).toBe(401)
  })
})

describe('listing with filters', () => {
  it.each([
    ['search on the registered name', () => `search=${encodeURIComponent(dogs.otherHandler!.registeredName)}`, ['otherHandler']],
    ['breed', () => `search=${TAG}&breed=rookmoor%20broken-coat`, ['otherHandler']],
    ['handler', () => `search=${TAG}&handler=${p.ids.handler}`, ['handled']],
    ['status retired', () => `search=${TAG}&status=retired`, ['retired']],
    ['show', () => `show=${show.id}`, ['entryNamesHandler']],
  ] as [string, () => string, string[]][])('by %s', async (_, query, expected) => {
    const listed = await ok<DogSummary[]>(p.manager, `/api/dogs?${query()}`, 'GET')
    expect(listed.map(d => d.id).sort()).toEqual(expected.map(n => dogs[n]!.id).sort())
  })

  it('status=all lists retired dogs beside active ones; the default hides them', async () => {
    const all = await ok<DogSummary[]>(p.manager, `/api/dogs?search=${TAG}&status=all`, 'GET')
    const active = await ok<DogSummary[]>(p.manager, `/api/dogs?search=${TAG}`, 'GET')
    expect(all.map(d => d.id)).toContain(dogs.retired!.id)
    expect(active.map(d => d.id)).not.toContain(dogs.retired!.id)
  })

  it('a search with LIKE wildcards matches them literally', async () => {
    expect(await ok(p.manager, `/api/dogs?search=${encodeURIComponent('%_')}`, 'GET')).toEqual([])
  })

  it.each([['handler=abc', 'handler'], ['status=lost', 'status'], ['show=-1', 'show']])('?%s is a 400 naming %s', async (query, field) => {
    expectFieldError(await call(p.manager, `/api/dogs?${query}`), field)
  })
})

describe('adding a dog', () => {
  const valid = () => ({ callName: `${TAG} Form`, registeredName: `Form ${TAG}`, breed: 'Ashgrove Wire Terrier', sex: 'dog', dateOfBirth: '2023-04-01' })

  it('a manager adds one with the default coat profile and it is audited', async () => {
    const dog = await ok<DogView>(p.manager, '/api/dogs', 'POST', valid())
    expect(dog.coatProfile.isDefault).toBe(true)
    expect(dog).toMatchObject({ callName: `${TAG} Form`, status: 'active', nextShow: null, readiness: null, handler: null })
    const [created] = await auditOf(db, 'dog', dog.id)
    expect(created).toMatchObject({ action: 'create', actor_id: p.ids.manager, before: null })
    expect(created!.after.callName).toBe(`${TAG} Form`)
  })

  it.each([['handler'], ['assistant']] as [Role][])('a %s may not add one (403)', async (role) => {
    expect((await call(jarOf(role), '/api/dogs', 'POST', valid())).status).toBe(403)
  })

  it.each([
    ['callName', () => ({ callName: '' })],
    ['sex', () => ({ sex: 'male' })],
    ['dateOfBirth', () => ({ dateOfBirth: '2027-02-31' })],
    ['dateOfBirth', () => ({ dateOfBirth: inDays(1) })],
    ['dateOfBirth', () => ({ dateOfBirth: '0000-01-01' })],
    ['ownerEmail', () => ({ ownerEmail: 'not-an-address' })],
    ['handlerId', () => ({ handlerId: p.ids.foreign })],
    ['handlerId', () => ({ handlerId: 99999999999 })],
    ['coatProfileId', () => ({ coatProfileId: foreignDog.coatProfileId })],
    ['callName', () => ({ callName: 'Nul\u0000char' })],
  ] as [string, () => object][])('a bad %s is a 400 naming it', async (field, change) => {
    expectFieldError(await call(p.manager, '/api/dogs', 'POST', { ...valid(), ...change() }), field)
  })

  it('an unknown field is a 400 that names it', async () => {
    const res = await call(p.manager, '/api/dogs', 'POST', { ...valid(), nickname: 'Sprout' })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/nickname/)
  })

  it('a registration number already used in the organisation, in any case, is a 409', async () => {
    await ok(p.manager, '/api/dogs', 'POST', { ...valid(), registrationNumber: `REG-${TAG}` })
    const res = await call(p.manager, '/api/dogs', 'POST', { ...valid(), registrationNumber: `reg-${TAG}`.toLowerCase() })
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/registration number/)
  })
})

describe('changing and deleting a dog', () => {
  it('a manager changes any field; the audit row holds before and after', async () => {
    const dog = await makeDog(p.manager)
    const changed = await ok<DogView>(p.manager, `/api/dogs/${dog.id}`, 'PATCH', { breed: 'Hallowmere Wire', handlerId: p.ids.handler })
    expect(changed).toMatchObject({ breed: 'Hallowmere Wire', handler: { id: p.ids.handler } })
    const update = (await auditOf(db, 'dog', dog.id)).find(a => a.action === 'update')!
    expect([update.before.breed, update.after.breed]).toEqual(['Ashgrove Wire Terrier', 'Hallowmere Wire'])
  })

  it('the dog\'s own handler may change its notes, and nothing else', async () => {
    const notes = await call(p.handler, `/api/dogs/${dogs.handled!.id}`, 'PATCH', { notes: 'Tends to sit in the ring.' })
    expect(notes.status).toBe(200)
    expect(notes.body.notes).toBe('Tends to sit in the ring.')
    expect((await call(p.handler, `/api/dogs/${dogs.handled!.id}`, 'PATCH', { breed: 'Other' })).status).toBe(403)
  })

  it.each([
    ['handler', 'entryNamesHandler', 403],
    ['handler', 'otherHandler', 404],
    ['assistant', 'openTask', 403],
  ] as [Role, string, number][])('the %s changing the %s dog gets %i', async (role, name, status) => {
    expect((await call(jarOf(role), `/api/dogs/${dogs[name]!.id}`, 'PATCH', { notes: 'x' })).status).toBe(status)
  })

  it.each([
    ['(body)', {}],
    ['status', { status: 'gone' }],
    ['coatProfileId', { coatProfileId: 0 }],
  ])('a patch with a bad %s is a 400 naming it', async (field, body) => {
    expectFieldError(await call(p.manager, `/api/dogs/${dogs.handled!.id}`, 'PATCH', body), field)
  })

  it('a dog with coat work on record is not deleted (409); a new one is, and the deletion is audited', async () => {
    const worked = await makeDog(p.manager)
    await logWork(p.manager, worked.id, -3, 'layer', ['neck'])
    expect((await call(p.manager, `/api/dogs/${worked.id}`, 'DELETE')).status).toBe(409)
    const fresh = await makeDog(p.manager)
    expect((await call(p.handler, `/api/dogs/${fresh.id}`, 'DELETE')).status).toBe(403)
    expect((await call(p.manager, `/api/dogs/${fresh.id}`, 'DELETE')).status).toBe(204)
    expect((await call(p.manager, `/api/dogs/${fresh.id}`)).status).toBe(404)
    const deleted = (await auditOf(db, 'dog', fresh.id)).find(a => a.action === 'delete')!
    expect(deleted.before.callName).toBe(fresh.callName)
  })

  it.each([['abc'], ['0'], ['1.5']])('the id %s is a 400 naming id', async (id) => {
    expectFieldError(await call(p.manager, `/api/dogs/${id}`), 'id')
  })

  it('an id past the integer range is a plain 404', async () => {
    expect((await call(p.manager, '/api/dogs/99999999999')).status).toBe(404)
  })
})

describe('readiness and the work-back plan, computed by shared/coat from the stored work', () => {
  let dog: DogView
  let near: ShowView
  let far: ShowView
  const work: CoatWork[] = []

  beforeAll(async () => {
    dog = await makeDog(p.manager, { handlerId: p.ids.handler })
    const everyRegion = profile.regions.map(r => r.key)
    // DESIGN.md §4 check value: a layer off every region 70 days before a show puts the sides at the start of bloom.
    for (const [days, kind, regions] of [[-56, 'layer', everyRegion], [-20, 'strip', ['ears']], [-5, 'bath', everyRegion]] as const) {
      await logWork(p.manager, dog.id, days, kind, [...regions])
      work.push({ date: inDays(days), kind, regions: [...regions] })
    }
    near = await makeShow(p.manager, 14)
    far = await makeShow(p.manager, 90)
    for (const s of [near, far]) await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: s.id, classCode: 'kc:open' })
    await giveTask(db, p.organisationId, dog.id, p.ids.assistant)
  })

  it.each([['manager'], ['handler'], ['assistant']] as [Role][])('by default for the dog\'s next show, for the %s too', async (role) => {
    const view = await ok<ReadinessView>(jarOf(role), `/api/dogs/${dog.id}/readiness`, 'GET')
    expect(view.show).toEqual({ id: near.id, name: near.name, firstDay: near.firstDay })
    expect(view.readiness).toEqual(assessDog(profile, work, near.firstDay))
    expect(view.readiness.regions.find(r => r.region === 'sides')!.state).toBe('in-bloom')
  })

  it('the dog view carries the same score for the next show', async () => {
    const view = await ok<DogView>(p.manager, `/api/dogs/${dog.id}`, 'GET')
    const expected = assessDog(profile, work, near.firstDay)
    expect(view.readiness).toEqual({ score: expected.score, onTrack: expected.onTrack })
    expect(view.nextShow?.id).toBe(near.id)
  })

  it.each([
    ['a chosen show', () => `show=${far.id}`, () => far.firstDay, () => far.id],
    ['a what-if date', () => `date=${inDays(40)}`, () => inDays(40), () => null],
    ['a show moved to a what-if date', () => `show=${far.id}&date=${inDays(50)}`, () => inDays(50), () => far.id],
  ] as [string, () => string, () => string, () => number | null][])('for %s', async (_, query, date, showId) => {
    const view = await ok<ReadinessView>(p.manager, `/api/dogs/${dog.id}/readiness?${query()}`, 'GET')
    expect(view.showDate).toBe(date())
    expect(view.show?.id ?? null).toBe(showId())
    expect(view.readiness).toEqual(assessDog(profile, work, date()))
  })

  it.each([
    ['another organisation\'s show', () => `show=${foreignShow.id}`],
    ['a show the dog is not entered in, for its handler', () => `show=${show.id}`],
  ] as [string, () => string][])('for %s is a 404', async (_, query) => {
    expect((await call(p.handler, `/api/dogs/${dog.id}/readiness?${query()}`)).status).toBe(404)
  })

  it.each([['show=abc', 'show'], ['date=2027-13-01', 'date'], ['date=3000-01-01', 'date']])('?%s is a 400 naming %s', async (query, field) => {
    expectFieldError(await call(p.manager, `/api/dogs/${dog.id}/readiness?${query}`), field)
  })

  it('the plan is planWorkBack for the dog\'s live entries from today, with the cautions', async () => {
    const view = await ok<PlanView>(p.assistant, `/api/dogs/${dog.id}/plan`, 'GET')
    expect(view.today).toBe(today())
    expect(view.shows.map(s => s.id)).toEqual([near.id, far.id])
    expect(view.plan).toEqual(planWorkBack(profile, work, [near.firstDay, far.firstDay], today()))
    expect(view.cautions).toEqual(COAT_CAUTIONS)
  })

  it('the history lists the dog\'s coat work as it was logged, and record changes only for managers and handlers', async () => {
    const manager = await ok<AuditEventView[]>(p.manager, `/api/dogs/${dog.id}/history`, 'GET')
    expect(manager.filter(e => e.entity === 'coat_work' && e.action === 'create')).toHaveLength(3)
    expect(manager.some(e => e.entity === 'dog')).toBe(true)
    const assistant = await ok<AuditEventView[]>(p.assistant, `/api/dogs/${dog.id}/history`, 'GET')
    expect(assistant.every(e => e.entity === 'coat_work')).toBe(true)
  })
})

describe('no input makes the dog routes fail', () => {
  it('POST /api/dogs and PATCH /api/dogs/:id answer 4xx or success, never 500', async () => {
    const valid = { callName: `${TAG} Fuzz`, registeredName: `Fuzz ${TAG}`, breed: 'Ashgrove Wire Terrier', sex: 'bitch', dateOfBirth: '2022-05-05', handlerId: p.ids.handler, coatProfileId: profile.id }
    await expectNo500(p.manager, 'POST', '/api/dogs', valid)
    const dog = await makeDog(p.manager)
    await expectNo500(p.manager, 'PATCH', `/api/dogs/${dog.id}`, { ...valid, ownerEmail: 'fuzz@owners.example', status: 'retired', notes: 'n' })
  })
})
