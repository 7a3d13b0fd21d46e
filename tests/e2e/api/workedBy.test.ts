import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { CoatWorkLogItem, DogView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, giveTask, inDays, kennelPeople, logWork, makeDog, ok, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
// Every dog this file makes, taken out again at the end (the demo dogs are never touched).
const made: DogView[] = []

async function throwAwayDog(fields: Record<string, unknown> = {}, jar = p.manager) {
  const dog = await makeDog(jar, fields)
  made.push(dog)
  return dog
}

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
})
afterAll(async () => {
  // A dog with coat work, entries or tasks cannot be deleted through the API (409, by design), so
  // what is left goes straight from the database; its coat work and tasks go with it (ON DELETE CASCADE).
  try {
    await db.query('DELETE FROM dogs WHERE id = ANY($1::int[])', [made.map(d => d.id)])
  }
  finally {
    await db.end()
  }
})

describe('who did the coat work (workedById)', () => {
  it('a handler names an assistant as having done it: stored, returned and listed that way', async () => {
    const dog = await throwAwayDog({ handlerId: p.ids.handler })
    const work = await logWork(p.handler, dog.id, -1, 'layer', ['neck', 'rear'], { workedById: p.ids.assistant }) as CoatWorkLogItem
    expect(work.workedBy?.id).toBe(p.ids.assistant)
    expect(work.recordedBy?.id).toBe(p.ids.handler)
    const { rows } = await db.query('SELECT worked_by_id, recorded_by_id FROM coat_work WHERE id = $1', [work.id])
    expect(rows[0]).toEqual({ worked_by_id: p.ids.assistant, recorded_by_id: p.ids.handler })
    const listed = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work`, 'GET')
    expect(listed.find(w => w.id === work.id)).toMatchObject({ workedBy: { id: p.ids.assistant }, recordedBy: { id: p.ids.handler } })
  })

  it('without workedById the caller did the work', async () => {
    const dog = await throwAwayDog({ handlerId: p.ids.handler })
    const work = await logWork(p.handler, dog.id, -1, 'roll', ['neck']) as CoatWorkLogItem
    expect([work.workedBy?.id, work.recordedBy?.id]).toEqual([p.ids.handler, p.ids.handler])
  })

  it.each([
    ['a member of another organisation', () => p.ids.foreign],
    ['an id no one has', () => 2_147_483_647],
    ['an id past the integer range', () => 2 ** 31],
  ])('%s is a 400 naming workedById, and nothing is stored', async (_, id) => {
    const dog = await throwAwayDog({ handlerId: p.ids.handler })
    const res = await call(p.handler, `/api/dogs/${dog.id}/work`, 'POST', { date: inDays(-1), kind: 'layer', regions: ['neck'], workedById: id() })
    expectFieldError(res, 'workedById')
    expect(res.body.message).toMatch(/member/)
    expect(await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work`, 'GET')).toEqual([])
  })

  it('changing the worker to someone outside the organisation is a 400 naming workedById too', async () => {
    const dog = await throwAwayDog({ handlerId: p.ids.handler })
    const work = await logWork(p.handler, dog.id, -1, 'card', ['rear'], { workedById: p.ids.assistant }) as CoatWorkLogItem
    expectFieldError(await call(p.handler, `/api/work/${work.id}`, 'PATCH', { workedById: p.ids.foreign }), 'workedById')
    const changed = await ok<CoatWorkLogItem>(p.handler, `/api/work/${work.id}`, 'PATCH', { workedById: p.ids.assistant2 }, 200)
    expect(changed.workedBy?.id).toBe(p.ids.assistant2)
  })
})

describe('deleting a dog (docs/api.md: managers only; 409 while anything is on record)', () => {
  it('without a session it is a 401', async () => {
    const dog = await throwAwayDog()
    expect((await call(null, `/api/dogs/${dog.id}`, 'DELETE')).status).toBe(401)
  })

  it.each([['handler'], ['assistant']] as const)('the %s gets a 403 on a dog in their reach, and the dog stays', async (role) => {
    const dog = await throwAwayDog({ handlerId: p.ids.handler })
    // The assistant reaches the dogs on their tasks; the handler the dogs they handle.
    if (role === 'assistant') await giveTask(db, p.organisationId, dog.id, p.ids.assistant)
    expect((await call(p[role], `/api/dogs/${dog.id}`)).status).toBe(200)
    expect((await call(p[role], `/api/dogs/${dog.id}`, 'DELETE')).status).toBe(403)
    expect((await call(p.manager, `/api/dogs/${dog.id}`)).status).toBe(200)
  })

  it('the manager deletes a dog with nothing on record: 204 with no body, then it is gone, and audited', async () => {
    const dog = await makeDog(p.manager)
    const res = await call(p.manager, `/api/dogs/${dog.id}`, 'DELETE')
    expect(res).toEqual({ status: 204, body: null })
    expect((await call(p.manager, `/api/dogs/${dog.id}`)).status).toBe(404)
    expect((await call(p.manager, `/api/dogs/${dog.id}`, 'DELETE')).status).toBe(404)
    const audit = (await auditOf(db, 'dog', dog.id)).find(a => a.action === 'delete')
    expect(audit).toMatchObject({ actor_id: p.ids.manager, before: { callName: dog.callName } })
  })

  it.each([
    ['coat work', async (dog: DogView) => { await logWork(p.manager, dog.id, -2, 'layer', ['neck']) }],
    ['only deleted coat work', async (dog: DogView) => {
      const work = await logWork(p.manager, dog.id, -2, 'layer', ['neck']) as CoatWorkLogItem
      await ok(p.manager, `/api/work/${work.id}`, 'DELETE', undefined, 204)
    }],
    ['a task', async (dog: DogView) => { await giveTask(db, p.organisationId, dog.id, p.ids.assistant) }],
  ])('the manager gets a 409 for a dog with %s, and the dog stays as it was', async (_, give) => {
    const dog = await throwAwayDog()
    await give(dog)
    const res = await call(p.manager, `/api/dogs/${dog.id}`, 'DELETE')
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/retire/)
    expect(await ok<DogView>(p.manager, `/api/dogs/${dog.id}`, 'GET')).toMatchObject({ id: dog.id, callName: dog.callName, status: 'active' })
  })

  it('another organisation\'s dog is a 404 for the manager, and it stays there', async () => {
    const foreignDog = await throwAwayDog({}, p.foreign)
    expect((await call(p.manager, `/api/dogs/${foreignDog.id}`, 'DELETE')).status).toBe(404)
    expect((await call(p.foreign, `/api/dogs/${foreignDog.id}`)).status).toBe(200)
    expect((await call(p.foreign, `/api/dogs/${foreignDog.id}`, 'DELETE')).status).toBe(204)
  })
})
