import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { addDays, assessDog, assessRegion } from '../../../../shared/coat'
import type { CoatWork } from '../../../../shared/coat'
import { day, profileArb, workArb } from './arbitraries'

const RUNS = { numRuns: 300 }
const SHOW_OFFSET = 200
const show = day(SHOW_OFFSET)

// Random profiles, work from 200 days before to 100 days after the show (DESIGN.md §4 rules).
const caseArb = profileArb.chain((profile) =>
  fc.record({
    profile: fc.constant(profile),
    work: workArb(profile, 0, SHOW_OFFSET + 100),
    region: fc.integer({ min: 0, max: profile.regions.length - 1 }),
  }),
)

describe('readiness properties (fast-check)', () => {
  it('a strip less than sproutDays before the show always leaves that region bare', () => {
    fc.assert(
      fc.property(caseArb, fc.nat(), ({ profile, work, region: i }, pick) => {
        const region = profile.regions[i]!
        fc.pre(region.sproutDays > 0)
        const strip: CoatWork = { date: addDays(show, -(pick % region.sproutDays)), kind: 'strip', regions: [region.key] }
        expect(assessRegion(region, [...work, strip], show, profile.toleranceDays).state).toBe('bare')
      }),
      RUNS,
    )
  })

  it('work dated after the show never changes its assessment', () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work, region: i }) => {
        const upToShow = work.filter((w) => w.date <= show)
        expect(assessDog(profile, work, show)).toEqual(assessDog(profile, upToShow, show))
        const region = profile.regions[i]!
        expect(assessRegion(region, work, show, profile.toleranceDays)).toEqual(assessRegion(region, upToShow, show, profile.toleranceDays))
      }),
      RUNS,
    )
  })

  it('the score is 100 exactly when the state is in-bloom, and stays within 0-100', () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work }) => {
        const dog = assessDog(profile, work, show)
        for (const r of dog.regions) {
          expect(r.score === 100).toBe(r.state === 'in-bloom')
          expect(r.score).toBeGreaterThanOrEqual(0)
          expect(r.score).toBeLessThanOrEqual(100)
          expect(Number.isInteger(r.score)).toBe(true)
        }
        expect(dog.score).toBeGreaterThanOrEqual(0)
        expect(dog.score).toBeLessThanOrEqual(100)
      }),
      RUNS,
    )
  })

  it('assessDog agrees region by region with assessRegion, and its on-track flag follows the rule', () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work }) => {
        const dog = assessDog(profile, work, show)
        dog.regions.forEach((r, i) => expect(r).toEqual(assessRegion(profile.regions[i]!, work, show, profile.toleranceDays)))
        const blocked = dog.regions.some((r) => r.state === 'bare' || r.state === 'no-record')
        expect(dog.onTrack).toBe(dog.score >= profile.onTrackScore && !blocked)
      }),
      RUNS,
    )
  })

  it('an in-bloom region has its anchor inside [show - sprout - grow - hold, show - sprout - grow]', () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work, region: i }) => {
        const region = profile.regions[i]!
        const r = assessRegion(region, work, show, profile.toleranceDays)
        const lead = region.sproutDays + region.growDays
        if (r.state === 'in-bloom') {
          expect(r.anchor! >= addDays(show, -lead - region.holdDays) && r.anchor! <= addDays(show, -lead)).toBe(true)
        }
      }),
      RUNS,
    )
  })
})
