import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { planWorkBack } from '../../../../shared/coat'
import { day, profileArb, workArb } from './arbitraries'
import { planViolations } from './planInvariants'

const TODAY_OFFSET = 400

// Random profiles, work done in the 400 days up to today, and one to six shows from 60 days
// before today to a year after it (issue 3, planWorkBack invariants).
const caseArb = profileArb.chain((profile) =>
  fc.record({
    profile: fc.constant(profile),
    work: workArb(profile, 0, TODAY_OFFSET, 40),
    shows: fc.array(fc.integer({ min: TODAY_OFFSET - 60, max: TODAY_OFFSET + 365 }).map(day), { minLength: 1, maxLength: 6 }),
    today: fc.integer({ min: 0, max: 3 }).map((d) => day(TODAY_OFFSET + d)),
  }),
)

describe('planWorkBack invariants (fast-check)', () => {
  // 400 random plans take a second or two, and far longer on a busy machine: a guard against hangs, not a speed check.
  it('holds every invariant of issue 3 for random profiles, histories, shows and todays', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work, shows, today }) => {
        const plan = planWorkBack(profile, work, shows, today)
        expect(planViolations(profile, work, shows, today, plan)).toEqual([])
      }),
      { numRuns: 400 },
    )
  })

  it('holds them when the shows are close together and the work recent, where windows overlap most', { timeout: 60_000 }, () => {
    const close = profileArb.chain((profile) =>
      fc.record({
        profile: fc.constant(profile),
        work: workArb(profile, TODAY_OFFSET - 120, TODAY_OFFSET, 20),
        shows: fc.array(fc.integer({ min: TODAY_OFFSET, max: TODAY_OFFSET + 120 }).map(day), { minLength: 2, maxLength: 8 }),
        today: fc.constant(day(TODAY_OFFSET)),
      }),
    )
    fc.assert(
      fc.property(close, ({ profile, work, shows, today }) => {
        expect(planViolations(profile, work, shows, today, planWorkBack(profile, work, shows, today))).toEqual([])
      }),
      { numRuns: 300 },
    )
  })

  it('is deterministic and does not depend on the order of the shows or the work', { timeout: 60_000 }, () => {
    fc.assert(
      fc.property(caseArb, ({ profile, work, shows, today }) => {
        const plan = planWorkBack(profile, work, shows, today)
        expect(planWorkBack(profile, [...work].reverse(), [...shows].reverse(), today)).toEqual(plan)
      }),
      { numRuns: 200 },
    )
  })
})
