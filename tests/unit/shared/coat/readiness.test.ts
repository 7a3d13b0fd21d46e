import { describe, expect, it } from 'vitest'
import { addDays, assessDog, assessRegion, DEFAULT_PROFILE } from '../../../../shared/coat'
import type { CoatProfile, CoatWork, RegionProfile, WorkKind } from '../../../../shared/coat'

const SHOW = '2026-09-12'
const ALL = DEFAULT_PROFILE.regions.map((r) => r.key)
const region = (key: string): RegionProfile => DEFAULT_PROFILE.regions.find((r) => r.key === key)!
const work = (offset: number, kind: WorkKind = 'layer', regions: string[] = ALL): CoatWork => ({ date: addDays(SHOW, offset), kind, regions })

describe('DEFAULT_PROFILE', () => {
  // DESIGN.md §4 table: sprout and growth are common practice (no source); hold days and
  // weights are the team's starting figures (from memory).
  it.each([
    ['head', 42, 14, 21, 1],
    ['ears', 42, 7, 14, 0.5],
    ['neck', 42, 14, 21, 1],
    ['throat', 42, 14, 21, 0.5],
    ['shoulders', 42, 14, 21, 1],
    ['chest', 42, 14, 21, 0.5],
    ['topline', 42, 21, 28, 2],
    ['sides', 42, 28, 28, 2],
    ['rear', 42, 14, 21, 1.5],
    ['tail', 42, 14, 21, 0.5],
  ])('%s: sprout %d, grow %d, hold %d, weight %d', (key, sproutDays, growDays, holdDays, weight) => {
    expect(region(key)).toMatchObject({ sproutDays, growDays, holdDays, weight })
  })

  it('has the ten regions of issue 3 in order, tolerance 21 and on-track score 85 (DESIGN.md §4)', () => {
    expect(ALL).toEqual(['head', 'ears', 'neck', 'throat', 'shoulders', 'chest', 'topline', 'sides', 'rear', 'tail'])
    expect(DEFAULT_PROFILE.toleranceDays).toBe(21)
    expect(DEFAULT_PROFILE.onTrackScore).toBe(85)
  })
})

describe('check values of DESIGN.md §4 (common practice, no source)', () => {
  it('a layer on every region 70 days out puts the sides at the start of bloom and the neck, shoulders and rear inside it', () => {
    const dog = assessDog(DEFAULT_PROFILE, [work(-70)], SHOW)
    const sides = dog.regions.find((r) => r.region === 'sides')!
    expect(sides).toMatchObject({ state: 'in-bloom', bloomStart: SHOW, anchor: '2026-07-04', score: 100 })
    for (const key of ['neck', 'shoulders', 'rear']) {
      const r = dog.regions.find((x) => x.region === key)!
      expect(r.state).toBe('in-bloom')
      expect(r.bloomStart! < SHOW && SHOW < r.bloomEnd!).toBe(true)
    }
  })

  it('the same layer 49 days out leaves the sides coming in, 21 days short', () => {
    const sides = assessRegion(region('sides'), [work(-49)], SHOW)
    expect(sides.state).toBe('coming-in')
    expect(sides.bloomStart).toBe(addDays(SHOW, 21))
    expect(sides.score).toBe(0)
  })

  it('70 days out scores the dog 98 and on track: only the ears are past their peak, 7 days (derived from the §4 figures)', () => {
    const dog = assessDog(DEFAULT_PROFILE, [work(-70)], SHOW)
    expect(dog.regions.find((r) => r.region === 'ears')).toMatchObject({ state: 'past-peak', score: 67 })
    // (10 * 100 + 0.5 * 67) / 10.5 = 98.43
    expect(dog).toMatchObject({ showDate: SHOW, score: 98, onTrack: true })
  })
})

describe('state boundaries (DESIGN.md §4), neck: sprout 42, grow 14, hold 21, tolerance 21', () => {
  // A layer `before` days ahead of the show: bare until day 42, coming in until 56, in bloom
  // through 77, then past its peak. Scores: round(100 * max(0, 1 - d / 21)).
  it.each([
    [0, 'bare', 0],
    [41, 'bare', 29],
    [42, 'coming-in', 33],
    [43, 'coming-in', 38],
    [55, 'coming-in', 95],
    [56, 'in-bloom', 100],
    [57, 'in-bloom', 100],
    [76, 'in-bloom', 100],
    [77, 'in-bloom', 100],
    [78, 'past-peak', 95],
    [97, 'past-peak', 5],
    [98, 'past-peak', 0],
    [130, 'past-peak', 0],
  ])('layer %d days before: %s, score %d', (before, state, score) => {
    const r = assessRegion(region('neck'), [work(-before, 'layer', ['neck'])], SHOW)
    expect(r).toMatchObject({ region: 'neck', state, score, anchor: addDays(SHOW, -before) })
    expect(r.bloomStart).toBe(addDays(SHOW, 56 - before))
    expect(r.bloomEnd).toBe(addDays(SHOW, 77 - before))
  })

  it('no strip or layer on or before the show: no-record, score 0, no dates', () => {
    expect(assessRegion(region('neck'), [work(-60, 'roll'), work(-50, 'card'), work(-40, 'bath'), work(-30, 'trim')], SHOW))
      .toEqual({ region: 'neck', state: 'no-record', anchor: null, bloomStart: null, bloomEnd: null, score: 0 })
  })
})

describe('score rounding: Math.round(100 * max(0, 1 - d / toleranceDays)), halves up (DESIGN.md §4)', () => {
  const quick: RegionProfile = { key: 'x', label: 'X', sproutDays: 0, growDays: 40, holdDays: 0, weight: 1 }
  it.each([
    [8, 1, 88],
    [8, 3, 63],
    [8, 4, 50],
    [8, 8, 0],
    [21, 1, 95],
    [21, 3, 86],
    [21, 10, 52],
    [21, 11, 48],
    [21, 20, 5],
    [21, 21, 0],
    [3, 2, 33],
  ])('tolerance %d, %d days short: %d', (tolerance, short, score) => {
    const r = assessRegion(quick, [{ date: addDays(SHOW, short - 40), kind: 'strip', regions: ['x'] }], SHOW, tolerance)
    expect(r.state).toBe('coming-in')
    expect(r.score).toBe(score)
  })
})

describe('anchor choice (DESIGN.md §4), neck', () => {
  const neck = (entries: [number, WorkKind][]) => assessRegion(region('neck'), entries.map(([o, k]) => work(o, k, ['neck'])), SHOW)
  it.each([
    ['the latest pull whose bloom has started', [[-80, 'layer'], [-60, 'layer']], -60, 'in-bloom'],
    ['a started pull over a newer one not yet started', [[-70, 'layer'], [-20, 'layer']], -70, 'in-bloom'],
    ['the earliest pull when none has started', [[-30, 'layer'], [-50, 'layer']], -50, 'coming-in'],
    ['a strip, dropping the layer before it', [[-70, 'layer'], [-60, 'strip']], -60, 'in-bloom'],
    ['a late strip over an earlier layer that would bloom', [[-70, 'layer'], [-30, 'strip']], -30, 'bare'],
    ['a layer after the latest strip', [[-100, 'strip'], [-60, 'layer']], -60, 'in-bloom'],
    ['the latest of two strips', [[-100, 'strip'], [-90, 'strip'], [-70, 'layer']], -70, 'in-bloom'],
    ['a layer on the day of the latest strip (not before it)', [[-60, 'strip'], [-60, 'layer']], -60, 'in-bloom'],
  ] as [string, [number, WorkKind][], number, string][])('%s', (_, entries, anchor, state) => {
    expect(neck(entries)).toMatchObject({ anchor: addDays(SHOW, anchor), state })
  })
})

describe('what readiness ignores', () => {
  it('work dated after the show, even a strip', () => {
    const before = assessDog(DEFAULT_PROFILE, [work(-70)], SHOW)
    expect(assessDog(DEFAULT_PROFILE, [work(-70), work(1, 'strip'), work(5, 'layer')], SHOW)).toEqual(before)
    expect(assessRegion(region('neck'), [work(1, 'layer', ['neck'])], SHOW).state).toBe('no-record')
  })

  it('work on regions the profile does not have', () => {
    const before = assessDog(DEFAULT_PROFILE, [work(-70)], SHOW)
    expect(assessDog(DEFAULT_PROFILE, [work(-70), work(-10, 'strip', ['mane', 'beard'])], SHOW)).toEqual(before)
    expect(assessRegion(region('neck'), [work(-60, 'layer', ['mane'])], SHOW).state).toBe('no-record')
  })
})

describe('errors name the bad value', () => {
  it.each([
    [{ date: '2026-07-04', kind: 'polish', regions: ['neck'] }, 'polish'],
    [{ date: '2027-02-31', kind: 'layer', regions: ['neck'] }, '2027-02-31'],
    [{ date: '2026-7-04', kind: 'layer', regions: ['neck'] }, '2026-7-04'],
    [{ date: 'last Tuesday', kind: 'strip', regions: ['neck'] }, 'last Tuesday'],
    [{ date: '2026-10-01', kind: 'shave', regions: ['neck'] }, 'shave'],
  ])('work %j', (entry, named) => {
    expect(() => assessRegion(region('neck'), [entry as CoatWork], SHOW)).toThrow(named)
    expect(() => assessDog(DEFAULT_PROFILE, [entry as CoatWork], SHOW)).toThrow(named)
  })

  it.each(['2026-02-30', '12/09/2026', ''])('show date %j', (show) => {
    expect(() => assessRegion(region('neck'), [], show)).toThrow(`"${show}"`)
    expect(() => assessDog(DEFAULT_PROFILE, [], show)).toThrow(`"${show}"`)
  })
})

describe('on-track rule: rounded score >= onTrackScore and no region bare or no-record (DESIGN.md §4)', () => {
  // Two regions a (always in bloom) and b; b's figures and work vary.
  const profile = (weightB: number, tolerance: number): CoatProfile => ({
    key: 't', label: 'T', toleranceDays: tolerance, onTrackScore: 85,
    regions: [
      { key: 'a', label: 'A', sproutDays: 0, growDays: 0, holdDays: 1000, weight: 1 },
      { key: 'b', label: 'B', sproutDays: 42, growDays: 14, holdDays: 0, weight: weightB },
    ],
  })
  const a: CoatWork = { date: addDays(SHOW, -10), kind: 'layer', regions: ['a'] }
  const b = (before: number): CoatWork => ({ date: addDays(SHOW, -before), kind: 'layer', regions: ['b'] })
  it.each([
    ['b past its peak, 3 short at tolerance 10: (100 + 70) / 2 = 85', 1, 10, [a, b(59)], 85, true],
    ['b past its peak, 8 short at tolerance 25: (100 + 68) / 2 = 84', 1, 25, [a, b(64)], 84, false],
    ['b past its peak, 31 short at tolerance 100: (100 + 69) / 2 = 84.5 rounds to 85', 1, 100, [a, b(87)], 85, true],
    ['b coming in, high score: on track', 1, 100, [a, b(50)], 97, true],
    ['b bare with a high score: not on track', 1, 1000, [a, b(10)], 98, false],
    ['b no-record with weight 0.1: score 91, not on track', 0.1, 21, [a], 91, false],
    ['everything in bloom', 1, 21, [a, b(56)], 100, true],
  ] as [string, number, number, CoatWork[], number, boolean][])('%s', (_, weightB, tolerance, entries, score, onTrack) => {
    expect(assessDog(profile(weightB, tolerance), entries, SHOW)).toMatchObject({ score, onTrack })
  })

  it('a profile whose weights are all 0 scores 0, not NaN', () => {
    const zero: CoatProfile = { ...profile(0, 21), regions: profile(0, 21).regions.map((r) => ({ ...r, weight: 0 })) }
    expect(assessDog(zero, [a], SHOW).score).toBe(0)
  })
})
