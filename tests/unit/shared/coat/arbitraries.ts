import fc from 'fast-check'
import { addDays, WORK_KINDS } from '../../../../shared/coat'
import type { CoatProfile, CoatWork, ISODate, RegionProfile } from '../../../../shared/coat'

const KEYS = ['head', 'neck', 'topline', 'sides', 'rear', 'ears'] as const

export const EPOCH: ISODate = '2026-01-05'

/** A date a number of days from EPOCH. */
export const day = (offset: number): ISODate => addDays(EPOCH, offset)

/** A region with random but plausible figures (0 days allowed, to reach the edges). */
export const regionArb = (key: string): fc.Arbitrary<RegionProfile> =>
  fc.record({
    key: fc.constant(key),
    label: fc.constant(key[0]!.toUpperCase() + key.slice(1)),
    sproutDays: fc.integer({ min: 0, max: 60 }),
    growDays: fc.integer({ min: 0, max: 35 }),
    holdDays: fc.integer({ min: 0, max: 35 }),
    weight: fc.integer({ min: 0, max: 4 }).map((w) => w / 2),
  })

export const profileArb: fc.Arbitrary<CoatProfile> = fc
  .subarray([...KEYS], { minLength: 1 })
  .chain((keys) => fc.tuple(...keys.map(regionArb)))
  .chain((regions) =>
    fc.record({
      key: fc.constant('random'),
      label: fc.constant('Random coat'),
      toleranceDays: fc.integer({ min: 1, max: 40 }),
      onTrackScore: fc.integer({ min: 0, max: 100 }),
      regions: fc.constant(regions),
    }),
  )

/** Work on the profile's regions and on a region no profile has, dated by day offset in [from, to]. */
export const workArb = (profile: CoatProfile, from: number, to: number, maxLength = 30): fc.Arbitrary<CoatWork[]> =>
  fc.array(
    fc.record({
      date: fc.integer({ min: from, max: to }).map(day),
      kind: fc.constantFrom(...WORK_KINDS, 'layer', 'layer', 'strip'),
      regions: fc.subarray([...profile.regions.map((r) => r.key), 'mane'], { minLength: 1 }),
    }),
    { maxLength },
  )
