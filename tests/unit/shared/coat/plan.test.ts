import { describe, expect, it } from 'vitest'
import { addDays, assessDog, dayWords, DEFAULT_PROFILE, planWorkBack, unreachableNote } from '../../../../shared/coat'
import type { CoatWork, PlanStep, WorkBackPlan } from '../../../../shared/coat'
import { planViolations } from './planInvariants'

// Windows below follow from the DESIGN.md §4 figures: a layer is useful for show S in
// [S - sprout - grow - hold, S - sprout - grow]; sides [S-98, S-70], topline [S-91, S-63],
// head/neck/throat/shoulders/chest/rear/tail [S-77, S-56], ears [S-63, S-49].
const SHOW = '2026-09-12'
const ALL = DEFAULT_PROFILE.regions.map((r) => r.key)
const BUT_EARS = ALL.filter((k) => k !== 'ears')
const at = (offset: number) => addDays(SHOW, offset)

const plan = (work: CoatWork[], shows: string[], today: string): WorkBackPlan => {
  const result = planWorkBack(DEFAULT_PROFILE, work, shows, today)
  expect(planViolations(DEFAULT_PROFILE, work, shows, today, result)).toEqual([])
  return result
}
const summary = (steps: PlanStep[]) => steps.map((s) => [s.date, s.kind, s.regions, s.forShows])

describe('planWorkBack, one show', () => {
  it('100 days out: two sessions (the ears cannot share the sides\' window), each with a bath the day before', () => {
    const result = plan([], [SHOW], at(-100))
    expect(summary(result.steps)).toEqual([
      [at(-74), 'bath', ALL, [SHOW]],
      [at(-73), 'layer', BUT_EARS, [SHOW]],
      [at(-57), 'bath', ALL, [SHOW]],
      [at(-56), 'layer', ['ears'], [SHOW]],
    ])
    expect(result.unreachable).toEqual([])
    expect(result.steps[1]!.note).toContain(`The last day to touch the sides is ${dayWords(at(-70))}.`)
    expect(result.steps[1]!.note).toContain(`For the topline it is ${dayWords(at(-63))}`)
    expect(result.steps[0]!.note).toContain(`for the layer on ${dayWords(at(-73))}`)
    expect(result.steps[0]!.note).toContain(`The last day to touch the sides is ${dayWords(at(-70))}.`)
    expect(result.steps[2]!.note).toContain(`The last day to touch the ears is ${dayWords(at(-49))}.`)
  })

  it('70 days out, the sides\' last day: the session is today, with no bath before it, and says so', () => {
    const today = at(-70)
    const result = plan([], [SHOW], today)
    const first = result.steps[0]!
    expect(first).toMatchObject({ date: today, kind: 'layer', regions: ['topline', 'sides'] })
    expect(first.note).toContain('This is the last day to touch the sides for this show.')
    expect(first.note).toContain('No bath first')
    expect(result.steps.filter((s) => s.kind === 'bath').every((s) => s.date >= today)).toBe(true)
  })

  it('60 days out: the topline and sides are too close, the rest is planned', () => {
    const result = plan([], [SHOW], at(-60))
    expect(result.unreachable).toEqual([
      { showDate: SHOW, region: 'topline', lastUsefulDate: at(-63) },
      { showDate: SHOW, region: 'sides', lastUsefulDate: at(-70) },
    ])
    expect(result.steps.filter((s) => s.kind === 'layer').flatMap((s) => s.regions).sort()).toEqual(ALL.filter((k) => k !== 'topline' && k !== 'sides').sort())
    expect(unreachableNote(DEFAULT_PROFILE, result.unreachable[1]!)).toBe(
      `The show on ${dayWords(SHOW)} is too close for the sides to be in bloom: the last day to take a layer off it was ${dayWords(at(-70))}.`,
    )
  })

  it('a show the work already brings into bloom needs nothing', () => {
    const work = [{ date: at(-70), kind: 'layer' as const, regions: BUT_EARS }, { date: at(-56), kind: 'layer' as const, regions: ['ears'] }]
    expect(plan(work, [SHOW], at(-20))).toEqual({ steps: [], unreachable: [] })
  })

  it('a show already past counts as unreachable where it was not in bloom, and gets no steps', () => {
    const result = plan([], [SHOW], at(1))
    expect(result.steps).toEqual([])
    expect(result.unreachable.map((u) => u.region)).toEqual(ALL)
  })

  it('no shows, no plan', () => {
    expect(plan([], [], SHOW)).toEqual({ steps: [], unreachable: [] })
  })
})

describe('planWorkBack, several shows', () => {
  it('one layer on the topline and sides serves two shows 14 days apart', () => {
    const later = at(14)
    const result = plan([], [later, SHOW, SHOW], '2026-05-01')
    const toplineSides = result.steps.filter((s) => s.kind === 'layer' && s.regions.includes('sides'))
    expect(toplineSides).toHaveLength(1)
    expect(toplineSides[0]).toMatchObject({ regions: ['topline', 'sides'], forShows: [SHOW, later] })
    expect(toplineSides[0]!.note).toContain(`for the shows on ${dayWords(SHOW)} and ${dayWords(later)}`)
  })

  it('a later show outside the bloom gets a further layer, and roll passes keep the coat tight between', () => {
    const work: CoatWork[] = [{ date: at(-70), kind: 'layer', regions: ALL }]
    const later = at(84)
    const result = plan(work, [SHOW, later], at(-42))
    expect(result.unreachable).toEqual([{ showDate: SHOW, region: 'ears', lastUsefulDate: at(-49) }])
    const layers = result.steps.filter((s) => s.kind === 'layer')
    expect(layers.every((s) => s.forShows.length === 1 && s.forShows[0] === later)).toBe(true)
    const rolls = result.steps.filter((s) => s.kind === 'roll')
    expect(rolls.length).toBeGreaterThan(0)
    expect(rolls.every((s) => s.date > SHOW && s.date < later && s.forShows[0] === later)).toBe(true)
    expect(rolls[0]!.note).toContain('taking only the longest hairs')
    expect(assessDog(DEFAULT_PROFILE, [...work, ...result.steps], later)).toMatchObject({ score: 100, onTrack: true })
  })
})

describe('planWorkBack and existing strips (a strip drops everything before it)', () => {
  it('a strip inside the window is itself the pull: the sides need nothing more', () => {
    const work: CoatWork[] = [{ date: at(-100), kind: 'layer', regions: ALL }, { date: at(-72), kind: 'strip', regions: ['sides'] }]
    const result = plan(work, [SHOW], at(-71))
    expect(result.steps.some((s) => s.regions.includes('sides') && s.kind === 'layer')).toBe(false)
    expect(result.steps.some((s) => s.regions.includes('topline') && s.kind === 'layer')).toBe(true)
  })

  it('a strip before the window means a new layer inside it, after the strip', () => {
    const work: CoatWork[] = [{ date: at(-120), kind: 'strip', regions: ['sides'] }]
    const sides = plan(work, [SHOW], at(-95)).steps.find((s) => s.kind === 'layer' && s.regions.includes('sides'))!
    expect(sides.date >= at(-95) && sides.date <= at(-70)).toBe(true)
  })

  it('a strip once it is too late leaves the region unreachable', () => {
    const work: CoatWork[] = [{ date: at(-75), kind: 'layer', regions: ALL }, { date: at(-65), kind: 'strip', regions: ['sides'] }]
    expect(plan(work, [SHOW], at(-64)).unreachable).toEqual([{ showDate: SHOW, region: 'sides', lastUsefulDate: at(-70) }])
  })
})

describe('planWorkBack errors name the bad value', () => {
  it.each([
    [[{ date: at(-10), kind: 'layer', regions: ['neck'] }], [SHOW], at(-20), at(-10)],
    [[{ date: at(-30), kind: 'rake', regions: ['neck'] }], [SHOW], at(-20), 'rake'],
    [[], ['2026-09-31'], at(-20), '2026-09-31'],
    [[], [SHOW], 'today', 'today'],
  ])('work %j, shows %j, today %s', (work, shows, today, named) => {
    expect(() => planWorkBack(DEFAULT_PROFILE, work as CoatWork[], shows, today)).toThrow(named)
  })
})

describe('dayWords', () => {
  // ISO 8601 week dates (DESIGN.md §6): 2026-12-31 is 2026-W53-4, a Thursday; 2027-01-04 is 2027-W01-1, a Monday;
  // 2028 is a leap year whose 29 February is a Tuesday (from memory).
  it.each([['2026-12-31', 'Thu 31 Dec 2026'], ['2027-01-04', 'Mon 4 Jan 2027'], ['2028-02-29', 'Tue 29 Feb 2028']])('%s reads as %s', (date, words) => {
    expect(dayWords(date)).toBe(words)
  })
})
