import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assessDog, type CoatWork } from '../../../shared/coat'
import type { CoatWorkLogItem, DogView, ProfileView, ReadinessView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, expectNo500, giveTask, inDays, kennelPeople, logWork, makeDog, makeShow, ok, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let dog: DogView
let hidden: DogView
let foreignWork: CoatWorkLogItem
let profile: ProfileView

type Role = 'manager' | 'handler' | 'assistant'
const asWork = (w: CoatWorkLogItem): CoatWork => ({ date: w.date, kind: w.kind, regions: w.regions })

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  // The handler handles it and the assistant has a task on it: all three roles reach it.
  dog = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: inDays(-400) })
  hidden = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  await giveTask(db, p.organisationId, dog.id, p.ids.assistant)
  const show = await makeShow(p.manager, 21)
  await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: 'kc:junior' })
  const foreignDog = await makeDog(p.foreign)
  foreignWork = await logWork(p.foreign, foreignDog.id, -1, 'layer', ['neck'])
  profile = await ok<ProfileView>(p.manager, `/api/profiles/${dog.coatProfileId}`, 'GET')
})
afterAll(() => db.end())

describe('logging coat work', () => {
  it.each([['manager'], ['handler'], ['assistant']] as [Role][])('the %s logs several regions at once and is its author', async (role) => {
    const work = await logWork(p[role], dog.id, -2, 'roll', ['neck', 'shoulders', 'rear'], { minutes: 25, notes: 'Light pass.' }) as CoatWorkLogItem
    expect(work).toMatchObject({ dogId: dog.id, kind: 'roll', regions: ['neck', 'shoulders', 'rear'], minutes: 25, canEdit: true, deletedAt: null })
    expect(work.recordedBy?.id).toBe(p.ids[role])
    expect(work.workedBy?.id).toBe(p.ids[role])
    const [created] = await auditOf(db, 'coat_work', work.id)
    expect(created).toMatchObject({ action: 'create', actor_id: p.ids[role] })
  })

  it('someone else may be named as having done it', async () => {
    const work = await logWork(p.manager, dog.id, -1, 'card', ['rear'], { workedById: p.ids.assistant2 }) as CoatWorkLogItem
    expect([work.workedBy?.id, work.recordedBy?.id]).toEqual([p.ids.assistant2, p.ids.manager])
  })

  it.each([
    ['a handler', 'handler'],
    ['an assistant', 'assistant'],
  ] as [string, Role][])('%s cannot log work on a dog out of their reach (404)', async (_, role) => {
    expect((await call(p[role], `/api/dogs/${hidden.id}/work`, 'POST', { date: inDays(-1), kind: 'layer', regions: ['neck'] })).status).toBe(404)
  })

  it.each([
    ['regions', () => ({ regions: [] })],
    ['regions', () => ({ regions: ['wings'] })],
    ['kind', () => ({ kind: 'shave' })],
    ['date', () => ({ date: inDays(1) })],
    ['date', () => ({ date: inDays(-401) })],
    ['date', () => ({ date: '2026-02-30' })],
    ['minutes', () => ({ minutes: -5 })],
    ['workedById', () => ({ workedById: p.ids.foreign })],
    ['notes', () => ({ notes: 'bad\u0000note' })],
  ] as [string, () => object][])('a bad %s is a 400 naming it', async (field, change) => {
    const res = await call(p.manager, `/api/dogs/${dog.id}/work`, 'POST', { date: inDays(-1), kind: 'layer', regions: ['neck'], ...change() })
    expectFieldError(res, field)
  })

  it('lists the dog\'s work newest first, and one region\'s history on its own', async () => {
    const ears = await logWork(p.manager, dog.id, -3, 'trim', ['ears'])
    const all = await ok<CoatWorkLogItem[]>(p.assistant, `/api/dogs/${dog.id}/work`, 'GET')
    expect(all.map(w => w.date)).toEqual([...all.map(w => w.date)].sort().reverse())
    const rear = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work?region=rear`, 'GET')
    expect(rear.length).toBeGreaterThan(0)
    expect(rear.every(w => w.regions.includes('rear'))).toBe(true)
    expect(all.map(w => w.id)).toContain(ears.id)
    expect(rear.map(w => w.id)).not.toContain(ears.id)
  })
})

describe('changing and deleting coat work', () => {
  let assistantWork: CoatWorkLogItem

  beforeAll(async () => {
    assistantWork = await logWork(p.assistant, dog.id, -30, 'layer', ['topline', 'sides'])
  })

  it('another person sees it as not theirs to change', async () => {
    const list = await ok<CoatWorkLogItem[]>(p.handler, `/api/dogs/${dog.id}/work`, 'GET')
    expect(list.find(w => w.id === assistantWork.id)?.canEdit).toBe(false)
  })

  it('its author changes it, and the audit row holds before and after', async () => {
    const changed = await ok<CoatWorkLogItem>(p.assistant, `/api/work/${assistantWork.id}`, 'PATCH', { regions: ['topline', 'sides', 'rear'], minutes: 40 })
    expect(changed).toMatchObject({ regions: ['topline', 'sides', 'rear'], minutes: 40 })
    const update = (await auditOf(db, 'coat_work', assistantWork.id)).find(a => a.action === 'update')!
    expect([update.before.regions, update.after.regions]).toEqual([['topline', 'sides'], ['topline', 'sides', 'rear']])
    expect(update.actor_id).toBe(p.ids.assistant)
  })

  it('someone who is neither its author nor a manager gets a 403', async () => {
    expect((await call(p.handler, `/api/work/${assistantWork.id}`, 'PATCH', { minutes: 1 })).status).toBe(403)
    expect((await call(p.handler, `/api/work/${assistantWork.id}`, 'DELETE')).status).toBe(403)
  })

  it('a manager may change anyone\'s work', async () => {
    expect((await ok<CoatWorkLogItem>(p.manager, `/api/work/${assistantWork.id}`, 'PATCH', { notes: 'Checked.' })).notes).toBe('Checked.')
  })

  it.each([
    ['regions', { regions: ['wings'] }],
    ['date', { date: '2999-01-01' }],
    ['(body)', {}],
    ['kind', { kind: 'shave' }],
  ])('a bad %s is a 400 naming it', async (field, body) => {
    expectFieldError(await call(p.manager, `/api/work/${assistantWork.id}`, 'PATCH', body), field)
  })

  it('deleting keeps the row with who deleted it, audits it, and readiness stops counting it', async () => {
    const target = await logWork(p.assistant, dog.id, -60, 'strip', ['neck'])
    expect((await call(p.assistant, `/api/work/${target.id}`, 'DELETE')).status).toBe(204)

    const live = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work`, 'GET')
    expect(live.map(w => w.id)).not.toContain(target.id)
    const withDeleted = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work?deleted=true`, 'GET')
    const kept = withDeleted.find(w => w.id === target.id)!
    expect(kept.deletedBy?.id).toBe(p.ids.assistant)
    expect(kept.deletedAt).not.toBeNull()
    expect(kept.canEdit).toBe(false)

    const deletion = (await auditOf(db, 'coat_work', target.id)).find(a => a.action === 'delete')!
    expect(deletion.before.deletedAt).toBeNull()
    expect(deletion.after.deletedById).toBe(p.ids.assistant)

    const readiness = await ok<ReadinessView>(p.manager, `/api/dogs/${dog.id}/readiness`, 'GET')
    expect(readiness.readiness).toEqual(assessDog(profile, live.map(asWork), readiness.showDate))
  })

  it('deleted work cannot be changed or deleted again (409)', async () => {
    const target = await logWork(p.manager, dog.id, -4, 'trim', ['head'])
    await ok(p.manager, `/api/work/${target.id}`, 'DELETE', undefined, 204)
    expect((await call(p.manager, `/api/work/${target.id}`, 'PATCH', { minutes: 3 })).status).toBe(409)
    expect((await call(p.manager, `/api/work/${target.id}`, 'DELETE')).status).toBe(409)
  })

  it.each([['handler'], ['assistant']] as [Role][])('only managers list deleted work: the %s gets a 403', async (role) => {
    expect((await call(p[role], `/api/dogs/${dog.id}/work?deleted=true`)).status).toBe(403)
  })

  it.each([['PATCH'], ['DELETE']])('%s on another organisation\'s work is a 404', async (method) => {
    expect((await call(p.manager, `/api/work/${foreignWork.id}`, method, method === 'PATCH' ? { minutes: 2 } : undefined)).status).toBe(404)
  })

  it('work on a dog out of the caller\'s reach is a 404, not a 403', async () => {
    const other = await logWork(p.manager, hidden.id, -1, 'bath', ['neck'])
    expect((await call(p.handler, `/api/work/${other.id}`, 'PATCH', { minutes: 2 })).status).toBe(404)
  })

  it.each([['abc'], ['-3']])('the work id %s is a 400 naming id', async (id) => {
    expectFieldError(await call(p.manager, `/api/work/${id}`, 'PATCH', { minutes: 2 }), 'id')
  })
})

describe('no input makes the coat-work routes fail', () => {
  it('POST /api/dogs/:id/work and PATCH /api/work/:id answer 4xx or success, never 500', async () => {
    const target = await makeDog(p.manager, { dateOfBirth: inDays(-900) })
    const valid = { date: inDays(-7), kind: 'layer', regions: ['neck', 'rear'], minutes: 12, notes: 'n', workedById: p.ids.assistant }
    await expectNo500(p.manager, 'POST', `/api/dogs/${target.id}/work`, valid)
    const work = await logWork(p.manager, target.id, -8, 'roll', ['neck'])
    await expectNo500(p.manager, 'PATCH', `/api/work/${work.id}`, valid)
  })
})
