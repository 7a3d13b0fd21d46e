import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, assessDog, isoWeekDate, planWorkBack, type CoatWork } from '../../../shared/coat'
import type { CoatWorkLogItem, DashboardView, DogSummary, DogView, ProfileView, ShowView } from '../../../shared/types/kennel'
import { call, database, giveTask, inDays, kennelPeople, logWork, makeDog, makeShow, ok, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let profile: ProfileView
const dogs: Record<string, DogView> = {}
const shows: Record<string, ShowView> = {}
const work: Record<string, CoatWork[]> = {}

// ISO 8601 weeks run Monday (day 1) to Sunday (day 7).
const monday = () => addDays(today(), 1 - Number(isoWeekDate(today()).slice(-1)))

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  profile = (await ok<ProfileView[]>(p.manager, '/api/profiles', 'GET')).find(pr => pr.isDefault)!
  const all = profile.regions.map(r => r.key)
  dogs.soon = await makeDog(p.manager, { handlerId: p.ids.handler })
  dogs.later = await makeDog(p.manager, { handlerId: p.ids.handler })
  dogs.bathOnly = await makeDog(p.manager)
  // DESIGN.md §4: the sides need 42 + 28 days from a layer, so a show 70 days out makes today the last day to take it.
  shows.plan = await makeShow(p.manager, 70)
  shows.soon = await makeShow(p.manager, 12, { entriesCloseDate: inDays(5), entriesCloseTime: '18:00' })
  shows.closingLater = await makeShow(p.manager, 40, { entriesCloseDate: inDays(20), entriesCloseTime: '18:00' })
  shows.closed = await makeShow(p.manager, 8, { entriesCloseDate: inDays(-1), entriesCloseTime: '18:00' })
  for (const [name, days, kind, regions] of [['soon', -50, 'layer', all], ['later', -15, 'layer', ['neck', 'rear']], ['bathOnly', -3, 'bath', all]] as const) {
    await logWork(p.manager, dogs[name]!.id, days, kind, [...regions])
    work[name] = [{ date: inDays(days), kind, regions: [...regions] }]
  }
  await ok(p.manager, '/api/entries', 'POST', { dogId: dogs.soon.id, showId: shows.soon.id, classCode: 'kc:open' })
  await ok(p.manager, '/api/entries', 'POST', { dogId: dogs.later.id, showId: shows.plan.id, classCode: 'kc:open' })
  for (const name of ['soon', 'later', 'bathOnly']) await giveTask(db, p.organisationId, dogs[name]!.id, p.ids.assistant2)
})
afterAll(() => db.end())

describe('the dashboard', () => {
  let view: DashboardView
  beforeAll(async () => {
    view = await ok<DashboardView>(p.assistant2, '/api/dashboard', 'GET')
  })
  const rowOf = (name: string) => view.dogs.find(d => d.dog.id === dogs[name]!.id)!

  it.each([['soon', 'soon'], ['later', 'plan']])('the %s dog carries shared/coat\'s score for its next show', (name, show) => {
    const expected = assessDog(profile, work[name]!, shows[show]!.firstDay)
    expect(rowOf(name)).toMatchObject({ nextShow: { id: shows[show]!.id }, score: expected.score, onTrack: expected.onTrack })
  })

  it('names at most three weakest regions, weakest first, none of them at full marks', () => {
    for (const row of view.dogs) {
      expect(row.weakest.length).toBeLessThanOrEqual(3)
      expect(row.weakest.map(w => w.score)).toEqual([...row.weakest.map(w => w.score)].sort((a, b) => a - b))
      expect(row.weakest.every(w => w.score < 100)).toBe(true)
    }
    const weakest = rowOf('later').weakest
    expect(weakest.length).toBe(3)
    expect(weakest[0]).toMatchObject({ label: profile.regions.find(r => r.key === weakest[0]!.region)!.label })
  })

  it('orders dogs by next show date, then score, dogs with no show last', () => {
    const keys = view.dogs.map(d => [d.nextShow?.firstDay ?? '9999-12-31', d.score ?? 101] as const)
    const sorted = [...keys].sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : a[1] - b[1]))
    expect(keys).toEqual(sorted)
  })

  it('this week\'s steps are the work-back plan\'s steps from Monday to Sunday of the ISO week', () => {
    const week = [monday(), addDays(monday(), 6)]
    const plan = planWorkBack(profile, work.later!, [shows.plan!.firstDay], today())
    const expected = plan.steps.filter(s => s.date >= week[0]! && s.date <= week[1]!)
    expect(expected.length).toBeGreaterThan(0)
    const steps = view.weekSteps.filter(s => s.dog.id === dogs.later!.id)
    expect(steps.map(s => s.step)).toEqual(expected)
    expect(steps[0]!.regionLabels).toEqual(expected[0]!.regions.map(k => profile.regions.find(r => r.key === k)!.label))
  })

  it('lists the dogs with no strip or layer on record', () => {
    const ids = view.noRecord.map(d => d.id)
    expect(ids).toContain(dogs.bathOnly!.id)
    expect(ids).not.toContain(dogs.soon!.id)
  })

  it('an assistant sees no shows closing (no show list for assistants)', () => {
    expect(view.closingSoon).toEqual([])
  })

  it('the trend is the mean score and share on track of the visible dogs on each of the next 12 Mondays', async () => {
    const first = monday() === today() ? today() : addDays(monday(), 7)
    const dates = Array.from({ length: 12 }, (_, i) => addDays(first, 7 * i))
    expect(view.trend.dates).toEqual(dates)
    // Recomputed from what the API gives the same caller: every dog they see, its work and profile.
    const visible = await ok<DogSummary[]>(p.assistant2, '/api/dogs', 'GET')
    const inputs = await Promise.all(visible.map(async d => ({
      profile: await ok<ProfileView>(p.assistant2, `/api/profiles/${d.coatProfileId}`, 'GET'),
      work: (await ok<CoatWorkLogItem[]>(p.assistant2, `/api/dogs/${d.id}/work`, 'GET')).map(w => ({ date: w.date, kind: w.kind, regions: w.regions })),
    })))
    const scores = dates.map(date => inputs.map(i => assessDog(i.profile, i.work, date)))
    // Bloomline's rounding (docs/api.md): the mean to one decimal place, the share to three.
    expect(view.trend.averageScore).toEqual(scores.map(s => Math.round((s.reduce((n, r) => n + r.score, 0) / s.length) * 10) / 10))
    expect(view.trend.onTrackShare).toEqual(scores.map(s => Math.round((s.filter(r => r.onTrack).length / s.length) * 1000) / 1000))
  })
})

describe('entries closing soon', () => {
  it('a manager sees the shows closing within 14 days, with the days left, and not the others', async () => {
    const view = await ok<DashboardView>(p.manager, '/api/dashboard', 'GET')
    const soon = view.closingSoon.find(c => c.show.id === shows.soon!.id)
    expect(soon?.closesInDays).toBe(5)
    const listed = view.closingSoon.map(c => c.show.id)
    expect(listed).not.toContain(shows.closingLater!.id)
    expect(listed).not.toContain(shows.closed!.id)
  })

  it('a handler sees only the shows their dogs are entered in', async () => {
    const view = await ok<DashboardView>(p.handler, '/api/dashboard', 'GET')
    expect(view.closingSoon.map(c => c.show.id)).toContain(shows.soon!.id)
    const hidden = await makeShow(p.manager, 9, { entriesCloseDate: inDays(3), entriesCloseTime: '18:00' })
    const again = await ok<DashboardView>(p.handler, '/api/dashboard', 'GET')
    expect(again.closingSoon.map(c => c.show.id)).not.toContain(hidden.id)
  })

  it('without a session the dashboard is a 401', async () => {
    expect((await call(null, '/api/dashboard')).status).toBe(401)
  })
})
