import { fromDayNumber, toDayNumber } from './dates'
import { checkProfile, checkRegionProfile, checkToleranceDays, DEFAULT_TOLERANCE_DAYS } from './profile'
import type { CoatProfile, CoatWork, DogReadiness, RegionProfile, RegionReadiness, RegionState, ISODate } from './types'
import { readWork, type RegionClock } from './work'

export const REGION_STATES: readonly RegionState[] = ['no-record', 'bare', 'coming-in', 'in-bloom', 'past-peak']

interface ClockAssessment {
  state: RegionState
  anchor: number | null
  bloomStart: number | null
  bloomEnd: number | null
  score: number
}

const NO_RECORD: ClockAssessment = { state: 'no-record', anchor: null, bloomStart: null, bloomEnd: null, score: 0 }

/** The anchor day of a region's clock for a show day (DESIGN.md §4), or null when nothing is left to anchor on. */
export function anchorDay(clock: RegionClock, show: number, sproutDays: number, growDays: number): number | null {
  let end = clock.length
  while (end > 0 && clock[end - 1]! >> 1 > show) end--
  if (end === 0) return null
  let start = 0
  for (let i = end - 1; i >= 0; i--) {
    if (clock[i]! & 1) {
      start = i
      break
    }
  }
  const lastStarted = show - sproutDays - growDays
  for (let i = end - 1; i >= start; i--) {
    const day = clock[i]! >> 1
    if (day <= lastStarted) return day
  }
  return clock[start]! >> 1
}

/** The anchor of a region's clock when it is in bloom for a show day, else NaN (assessClock without the allocation). */
export function bloomAnchor(clock: RegionClock, show: number, region: RegionProfile): number {
  const anchor = anchorDay(clock, show, region.sproutDays, region.growDays)
  if (anchor === null) return Number.NaN
  const bloomStart = anchor + region.sproutDays + region.growDays
  return bloomStart <= show && show <= bloomStart + region.holdDays ? anchor : Number.NaN
}

// The state and score of a region's clock for a show day, by the rules of DESIGN.md §4.
function assessClock(clock: RegionClock, show: number, region: RegionProfile, toleranceDays: number): ClockAssessment {
  const anchor = anchorDay(clock, show, region.sproutDays, region.growDays)
  if (anchor === null) return NO_RECORD
  const bloomStart = anchor + region.sproutDays + region.growDays
  const bloomEnd = bloomStart + region.holdDays
  let state: RegionState
  let shortBy: number
  if (show < anchor + region.sproutDays) {
    state = 'bare'
    shortBy = bloomStart - show
  } else if (show < bloomStart) {
    state = 'coming-in'
    shortBy = bloomStart - show
  } else if (show <= bloomEnd) {
    state = 'in-bloom'
    shortBy = 0
  } else {
    state = 'past-peak'
    shortBy = show - bloomEnd
  }
  const score = state === 'in-bloom' ? 100 : Math.round(100 * Math.max(0, 1 - shortBy / toleranceDays))
  return { state, anchor, bloomStart, bloomEnd, score }
}

function toRegionReadiness(region: string, assessment: ClockAssessment): RegionReadiness {
  return {
    region,
    state: assessment.state,
    anchor: assessment.anchor === null ? null : fromDayNumber(assessment.anchor),
    bloomStart: assessment.bloomStart === null ? null : fromDayNumber(assessment.bloomStart),
    bloomEnd: assessment.bloomEnd === null ? null : fromDayNumber(assessment.bloomEnd),
    score: assessment.score,
  }
}

/** Readiness of one region for a show on `showDate`, from the dog's coat work (DESIGN.md §4). */
export function assessRegion(
  region: RegionProfile,
  work: CoatWork[],
  showDate: ISODate,
  toleranceDays: number = DEFAULT_TOLERANCE_DAYS,
): RegionReadiness {
  checkRegionProfile(region)
  checkToleranceDays(toleranceDays)
  const show = toDayNumber(showDate)
  const clock = readWork(work, [region.key]).clocks[0]!
  return toRegionReadiness(region.key, assessClock(clock, show, region, toleranceDays))
}

/** Weighted readiness of a dog for a show and whether it is on track (DESIGN.md §4). */
export function assessDog(profile: CoatProfile, work: CoatWork[], showDate: ISODate): DogReadiness {
  checkProfile(profile)
  const show = toDayNumber(showDate)
  const { clocks } = readWork(work, profile.regions.map((r) => r.key))
  const regions: RegionReadiness[] = new Array(profile.regions.length)
  let weighted = 0
  let weights = 0
  let blocked = false
  for (let i = 0; i < profile.regions.length; i++) {
    const region = profile.regions[i]!
    const assessment = assessClock(clocks[i]!, show, region, profile.toleranceDays)
    regions[i] = toRegionReadiness(region.key, assessment)
    weighted += assessment.score * region.weight
    weights += region.weight
    if (assessment.state === 'bare' || assessment.state === 'no-record') blocked = true
  }
  // A profile whose weights are all 0 has nothing to average; it scores 0 rather than NaN.
  const score = weights > 0 ? Math.round(weighted / weights) : 0
  return { showDate, score, onTrack: score >= profile.onTrackScore && !blocked, regions }
}
