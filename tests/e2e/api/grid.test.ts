import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assessDog, daysBetween, type CoatProfile, type CoatWork, type ISODate } from '../../../shared/coat'
import type { DogView, GridCell, GridRow, GridView, ProfileView, ShowView } from '../../../shared/types/kennel'
import { call, database, expectFieldError, giveTask, inDays, kennelPeople, logWork, makeDog, makeShow, ok, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let base: ProfileView
let bearded: ProfileView
let near: ShowView
let far: ShowView
let inesShow: ShowView
let foreignShow: ShowView
const dogs: Record<string, DogView> = {}
const work: Record<string, CoatWork[]> = {}

type Role = 'manager' | 'handler' | 'assistant'

async function pull(name: string, days: number, kind: 'layer' | 'strip', regions: string[]) {
  await logWork(p.manager, dogs[name]!.id, days, kind, regions)
  ;(work[name] ??= []).push({ date: inDays(days), kind, regions })
}

/** A grid cell as the coat model's region readiness defines it (GridCell in shared/types/kennel.ts). */
function expectedCells(profile: CoatProfile, dogWork: CoatWork[], date: ISODate): Record<string, GridCell> {
  return Object.fromEntries(assessDog(profile, dogWork, date).regions.map(r => [r.region, {
    state: r.state,
    score: r.score,
    bloomStart: r.bloomStart,
    bloomEnd: r.bloomEnd,
    daysToBloom: (r.state === 'bare' || r.state === 'coming-in') && r.bloomStart ? daysBetween(date, r.bloomStart) : null,
    daysPastPeak: r.state === 'past-peak' && r.bloomEnd ? daysBetween(r.bloomEnd, date) : null,
  }]))
}

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  base = (await ok<ProfileView[]>(p.manager, '/api/profiles', 'GET')).find(pr => pr.isDefault)!
  const copy = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: base.id, label: 'Bearded wire' })
  bearded = await ok<ProfileView>(p.manager, `/api/profiles/${copy.id}`, 'PATCH', {
    regions: [...base.regions, { key: 'beard', label: 'Beard', sproutDays: 42, growDays: 21, holdDays: 28, weight: 1 }],
  })
  near = await makeShow(p.manager, 14)
  far = await makeShow(p.manager, 60)
  inesShow = await makeShow(p.manager, 30)
  foreignShow = await makeShow(p.foreign, 20)
  dogs.near = await makeDog(p.manager, { handlerId: p.ids.handler })
  dogs.far = await makeDog(p.manager, { handlerId: p.ids.handler })
  dogs.none = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  dogs.inesEntered = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  dogs.bearded = await makeDog(p.manager, { handlerId: p.ids.handler, coatProfileId: bearded.id })
  dogs.retired = await makeDog(p.manager, { handlerId: p.ids.handler, status: 'retired' })
  const all = base.regions.map(r => r.key)
  await pull('near', -60, 'layer', all)
  await pull('near', -30, 'strip', ['ears', 'tail'])
  await pull('far', -20, 'layer', ['neck', 'shoulders', 'topline', 'sides'])
  await pull('none', -90, 'layer', all)
  await pull('bearded', -50, 'layer', [...all, 'beard'])
  const enter = (dog: string, show: ShowView) => ok(p.manager, '/api/entries', 'POST', { dogId: dogs[dog]!.id, showId: show.id, classCode: 'kc:open' })
  await enter('near', near)
  await enter('far', far)
  await enter('bearded', near)
  await enter('retired', near)
  await enter('inesEntered', inesShow)
  await giveTask(db, p.organisationId, dogs.none.id, p.ids.assistant)
})
afterAll(() => db.end())

const rowOf = (grid: GridView, name: string) => grid.rows.find(r => r.dog.id === dogs[name]!.id)
const profileOf = (name: string) => (name === 'bearded' ? bearded : base)

describe('each dog for its own next show', () => {
  let grid: GridView
  beforeAll(async () => {
    grid = await ok<GridView>(p.manager, '/api/grid', 'GET')
  })

  it('is the default, and the same as ?show=next', async () => {
    expect(grid).toMatchObject({ mode: 'next', show: null, today: today() })
    const next = await ok<GridView>(p.manager, '/api/grid?show=next', 'GET')
    expect(rowOf(next, 'near')).toEqual(rowOf(grid, 'near'))
  })

  it.each([['near', () => near], ['far', () => far], ['bearded', () => near]] as [string, () => ShowView][])(
    'the %s dog\'s cells and score are shared/coat\'s for its next show', (name, show) => {
      const row = rowOf(grid, name)!
      const expected = assessDog(profileOf(name), work[name]!, show().firstDay)
      expect(row.show).toEqual({ id: show().id, name: show().name, firstDay: show().firstDay })
      expect([row.score, row.onTrack]).toEqual([expected.score, expected.onTrack])
      expect(row.cells).toMatchObject(expectedCells(profileOf(name), work[name]!, show().firstDay))
    })

  it('a dog with no next show shows its coat as it is today, with no score', () => {
    const row = rowOf(grid, 'none')!
    expect([row.show, row.score, row.onTrack]).toEqual([null, null, null])
    expect(row.cells).toMatchObject(expectedCells(base, work.none!, today()))
  })

  it('rows run by next show date, dogs with none last', () => {
    const order = ['near', 'far', 'none'].map(n => grid.rows.indexOf(rowOf(grid, n)!))
    expect(order).toEqual([...order].sort((a, b) => a - b))
  })

  it('retired dogs are left out', () => {
    expect(rowOf(grid, 'retired')).toBeUndefined()
  })

  it('columns are the default profile\'s regions in order, then other profiles\' extra ones; cells a profile lacks are null', () => {
    expect(grid.regions.slice(0, base.regions.length)).toEqual(base.regions.map(r => ({ key: r.key, label: r.label })))
    expect(grid.regions.map(r => r.key)).toContain('beard')
    expect(rowOf(grid, 'near')!.cells.beard).toBeNull()
    expect(rowOf(grid, 'bearded')!.cells.beard?.state).toBe('in-bloom')
  })
})

describe('every dog for one show', () => {
  it('assesses every row for the show\'s first day, dogs entered in it first', async () => {
    const grid = await ok<GridView>(p.manager, `/api/grid?show=${far.id}`, 'GET')
    expect(grid).toMatchObject({ mode: 'show', show: { id: far.id, firstDay: far.firstDay } })
    for (const name of ['near', 'far', 'none', 'bearded']) {
      const row = rowOf(grid, name)!
      expect(row.score).toBe(assessDog(profileOf(name), work[name]!, far.firstDay).score)
      expect(row.cells).toMatchObject(expectedCells(profileOf(name), work[name]!, far.firstDay))
    }
    expect(rowOf(grid, 'far')!.show?.id).toBe(far.id)
    expect(rowOf(grid, 'near')!.show).toBeNull()
    const firstNotEntered = grid.rows.findIndex(r => r.show === null)
    expect(grid.rows.slice(firstNotEntered).every(r => r.show === null)).toBe(true)
  })
})

describe('who sees which row', () => {
  const ours = (grid: GridView) => Object.keys(dogs).filter(n => rowOf(grid, n)).sort()

  it.each([
    ['manager', ['bearded', 'far', 'inesEntered', 'near', 'none']],
    ['handler', ['bearded', 'far', 'near']],
    ['assistant', ['none']],
  ] as [Role, string[]][])('the %s gets rows for exactly the dogs in their reach', async (role, expected) => {
    expect(ours(await ok<GridView>(p[role], '/api/grid', 'GET'))).toEqual(expected)
  })

  it('a handler may not pick a show none of their dogs is entered in (404)', async () => {
    expect((await call(p.handler, `/api/grid?show=${inesShow.id}`)).status).toBe(404)
    expect((await call(p.handler, `/api/grid?show=${near.id}`)).status).toBe(200)
  })

  it.each([
    ['another organisation\'s show', () => `${foreignShow.id}`],
    ['an id past the integer range', () => '99999999999'],
  ] as [string, () => string][])('?show= naming %s is a 404', async (_, show) => {
    expect((await call(p.manager, `/api/grid?show=${show()}`)).status).toBe(404)
  })

  it.each([['abc'], ['0']])('?show=%s is a 400 naming show', async (show) => {
    expectFieldError(await call(p.manager, `/api/grid?show=${show}`), 'show')
  })

  it('rows carry no owner contact for anyone', async () => {
    const grid = await ok<GridView>(p.manager, '/api/grid', 'GET')
    const row: GridRow = rowOf(grid, 'near')!
    expect(Object.keys(row.dog).sort()).toEqual(['breed', 'callName', 'handler', 'id', 'registeredName'])
  })
})
