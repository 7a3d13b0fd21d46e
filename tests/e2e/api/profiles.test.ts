import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assessDog, DEFAULT_PROFILE } from '../../../shared/coat'
import type { ProfileView, ReadinessView } from '../../../shared/types/kennel'
import { auditOf, call, database, expectFieldError, expectNo500, inDays, kennelPeople, logWork, makeDog, makeShow, ok, TAG, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let defaultProfile: ProfileView
let copy: ProfileView

type Role = 'manager' | 'handler' | 'assistant'

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  const list = await ok<ProfileView[]>(p.manager, '/api/profiles', 'GET')
  defaultProfile = list.find(pr => pr.isDefault)!
  copy = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: defaultProfile.id, label: `${TAG} Fast neck` })
})
afterAll(() => db.end())

describe('listing and reading profiles', () => {
  it.each([['manager'], ['handler'], ['assistant']] as [Role][])('the %s sees the default profile first', async (role) => {
    const list = await ok<ProfileView[]>(p[role], '/api/profiles', 'GET')
    expect(list[0]!.isDefault).toBe(true)
    expect(list.filter(pr => pr.isDefault)).toHaveLength(1)
  })

  it('an organisation without a default profile gets the built-in one on first look, once', async () => {
    // Take Northfold's default away (its dogs keep their profile, which is no longer the default).
    await db.query(`UPDATE coat_profiles SET is_default = false, key = key || '-${TAG.toLowerCase()}' WHERE organisation_id = $1 AND is_default`, [p.foreignOrganisationId])
    const [first, second] = await Promise.all([
      ok<ProfileView[]>(p.foreign, '/api/profiles', 'GET'),
      ok<ProfileView[]>(p.foreign, '/api/profiles', 'GET'),
    ])
    const defaults = first.filter(pr => pr.isDefault)
    expect(defaults).toHaveLength(1)
    expect(second.filter(pr => pr.isDefault).map(pr => pr.id)).toEqual(defaults.map(pr => pr.id))
    expect(defaults[0]).toMatchObject({
      key: DEFAULT_PROFILE.key,
      toleranceDays: DEFAULT_PROFILE.toleranceDays,
      onTrackScore: DEFAULT_PROFILE.onTrackScore,
      regions: DEFAULT_PROFILE.regions,
      dogCount: 0,
    })
  })

  it('a copy has its own key and the source\'s figures, and is audited', async () => {
    expect(copy).toMatchObject({ isDefault: false, dogCount: 0, regions: defaultProfile.regions, onTrackScore: defaultProfile.onTrackScore })
    expect(copy.key).not.toBe(defaultProfile.key)
    const again = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: copy.id, label: `${TAG} Fast neck` })
    expect(again.key).not.toBe(copy.key)
    expect((await auditOf(db, 'coat_profile', copy.id))[0]!.action).toBe('create')
  })

  it.each([['GET'], ['PATCH'], ['DELETE']])('%s another organisation\'s profile is a 404', async (method) => {
    const foreign = (await ok<ProfileView[]>(p.foreign, '/api/profiles', 'GET'))[0]!
    expect((await call(p.manager, `/api/profiles/${foreign.id}`, method, method === 'PATCH' ? { label: 'Taken over' } : undefined)).status).toBe(404)
  })

  it('copying another organisation\'s profile is a 400 naming copyFrom', async () => {
    const foreign = (await ok<ProfileView[]>(p.foreign, '/api/profiles', 'GET'))[0]!
    expectFieldError(await call(p.manager, '/api/profiles', 'POST', { copyFrom: foreign.id, label: 'Borrowed' }), 'copyFrom')
  })
})

describe('editing a profile', () => {
  it.each([['handler'], ['assistant']] as [Role][])('a %s may not copy, edit or delete (403)', async (role) => {
    expect((await call(p[role], '/api/profiles', 'POST', { copyFrom: copy.id, label: 'Mine' })).status).toBe(403)
    expect((await call(p[role], `/api/profiles/${copy.id}`, 'PATCH', { label: 'Mine' })).status).toBe(403)
    expect((await call(p[role], `/api/profiles/${copy.id}`, 'DELETE')).status).toBe(403)
  })

  it.each([
    ['regions', () => ({ regions: [] })],
    ['regions', () => ({ regions: [defaultProfile.regions[0], defaultProfile.regions[0]] })],
    ['regions.0.growDays', () => ({ regions: [{ ...defaultProfile.regions[0], growDays: -1 }] })],
    ['regions.0.key', () => ({ regions: [{ ...defaultProfile.regions[0], key: 'Neck Area' }] })],
    ['toleranceDays', () => ({ toleranceDays: 0 })],
    ['onTrackScore', () => ({ onTrackScore: 101 })],
    ['label', () => ({ label: 'x' })],
  ] as [string, () => object][])('a bad %s is a 400 naming it', async (field, body) => {
    expectFieldError(await call(p.manager, `/api/profiles/${copy.id}`, 'PATCH', body()), field)
  })

  it('readiness follows the edited figures at once, as shared/coat computes them', async () => {
    const profile = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: defaultProfile.id, label: `${TAG} Slow sides` })
    const dog = await makeDog(p.manager, { coatProfileId: profile.id })
    const show = await makeShow(p.manager, 20)
    await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: 'kc:open' })
    await logWork(p.manager, dog.id, -45, 'layer', profile.regions.map(r => r.key))
    const work = [{ date: inDays(-45), kind: 'layer' as const, regions: profile.regions.map(r => r.key) }]

    const regions = profile.regions.map(r => (r.key === 'sides' ? { ...r, growDays: 35 } : r))
    const edited = await ok<ProfileView>(p.manager, `/api/profiles/${profile.id}`, 'PATCH', { regions, toleranceDays: 30, onTrackScore: 70 })
    expect(edited).toMatchObject({ toleranceDays: 30, onTrackScore: 70, dogCount: 1 })
    const readiness = await ok<ReadinessView>(p.manager, `/api/dogs/${dog.id}/readiness`, 'GET')
    expect(readiness.readiness).toEqual(assessDog(edited, work, show.firstDay))
    const update = (await auditOf(db, 'coat_profile', profile.id)).find(a => a.action === 'update')!
    expect([update.before.toleranceDays, update.after.toleranceDays]).toEqual([defaultProfile.toleranceDays, 30])
  })
})

describe('deleting a profile', () => {
  it('the default profile is kept (409)', async () => {
    expect((await call(p.manager, `/api/profiles/${defaultProfile.id}`, 'DELETE')).status).toBe(409)
  })

  it('a profile dogs use is kept (409)', async () => {
    const used = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: defaultProfile.id, label: `${TAG} In use` })
    await makeDog(p.manager, { coatProfileId: used.id })
    const res = await call(p.manager, `/api/profiles/${used.id}`, 'DELETE')
    expect(res.status).toBe(409)
    expect(res.body.message).toMatch(/1 dog uses/)
  })

  it('an unused copy is deleted, and the deletion audited', async () => {
    expect((await call(p.manager, `/api/profiles/${copy.id}`, 'DELETE')).status).toBe(204)
    expect((await call(p.manager, `/api/profiles/${copy.id}`)).status).toBe(404)
    expect((await auditOf(db, 'coat_profile', copy.id)).map(a => a.action)).toEqual(['create', 'delete'])
  })
})

describe('no input makes the profile routes fail', () => {
  it('POST /api/profiles and PATCH /api/profiles/:id answer 4xx or success, never 500', async () => {
    await expectNo500(p.manager, 'POST', '/api/profiles', { copyFrom: defaultProfile.id, label: `${TAG} Fuzz` }, 20)
    const target = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: defaultProfile.id, label: `${TAG} Fuzz target` })
    await expectNo500(p.manager, 'PATCH', `/api/profiles/${target.id}`, { label: 'Fuzzed', toleranceDays: 14, onTrackScore: 80, regions: defaultProfile.regions })
  })
})
