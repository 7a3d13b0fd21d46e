import type { CoatProfile, RegionProfile } from './types'

export const DEFAULT_TOLERANCE_DAYS = 21
export const DEFAULT_ON_TRACK_SCORE = 85

// DESIGN.md §4: the 42-day sprout and 7-28-day growth are common practice among people who
// strip coats (no published source); the per-region split, hold days and weights are the
// team's starting figures, from memory, and every one is editable per profile.
function region(key: string, label: string, growDays: number, holdDays: number, weight: number): RegionProfile {
  return { key, label, sproutDays: 42, growDays, holdDays, weight }
}

/** The "hand-stripped double coat" profile with the figures of DESIGN.md §4. */
export const DEFAULT_PROFILE: CoatProfile = {
  key: 'hand-stripped-double-coat',
  label: 'Hand-stripped double coat',
  toleranceDays: DEFAULT_TOLERANCE_DAYS,
  onTrackScore: DEFAULT_ON_TRACK_SCORE,
  regions: [
    region('head', 'Head', 14, 21, 1),
    region('ears', 'Ears', 7, 14, 0.5),
    region('neck', 'Neck', 14, 21, 1),
    region('throat', 'Throat', 14, 21, 0.5),
    region('shoulders', 'Shoulders', 14, 21, 1),
    region('chest', 'Chest', 14, 21, 0.5),
    region('topline', 'Topline', 21, 28, 2),
    region('sides', 'Sides', 28, 28, 2),
    region('rear', 'Rear', 14, 21, 1.5),
    region('tail', 'Tail', 14, 21, 0.5),
  ],
}

const DAY_FIELDS = ['sproutDays', 'growDays', 'holdDays'] as const

/** Throws an Error naming the region and figure when a region's day counts are not whole days of 0 or more. */
export function checkRegionProfile(region: RegionProfile): void {
  for (const field of DAY_FIELDS) {
    const value = region[field]
    if (!Number.isInteger(value) || value < 0) {
      throw new Error(`Region ${JSON.stringify(region.key)} has ${field} ${String(value)}: expected whole days, 0 or more`)
    }
  }
  if (!Number.isFinite(region.weight) || region.weight < 0) {
    throw new Error(`Region ${JSON.stringify(region.key)} has weight ${String(region.weight)}: expected a number, 0 or more`)
  }
}

/** Throws an Error naming the value when a tolerance is not a positive number of days. */
export function checkToleranceDays(toleranceDays: number): void {
  if (!Number.isFinite(toleranceDays) || toleranceDays <= 0) {
    throw new Error(`Tolerance ${String(toleranceDays)} days: expected a number of days above 0`)
  }
}

/** Throws an Error naming the problem when a profile's tolerance, region figures or region keys are unusable. */
export function checkProfile(profile: CoatProfile): void {
  checkToleranceDays(profile.toleranceDays)
  const keys = new Set<string>()
  for (const region of profile.regions) {
    checkRegionProfile(region)
    if (keys.has(region.key)) throw new Error(`Profile ${JSON.stringify(profile.key)} has region ${JSON.stringify(region.key)} twice`)
    keys.add(region.key)
  }
}
