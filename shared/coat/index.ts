export type {
  ClassCheck,
  ClassDefinition,
  CoatProfile,
  CoatWork,
  DogReadiness,
  ISODate,
  PlanStep,
  RegionProfile,
  RegionReadiness,
  RegionState,
  RuleSet,
  RuleSetInfo,
  Unreachable,
  UpperBound,
  WorkBackPlan,
  WorkKind,
} from './types'
export { COAT_CAUTIONS } from './cautions'
export { classAgeWindow, isEligibleForClass, type ClassAgeWindow } from './classAge'
export { addCalendarMonths, addDays, daysBetween, daysInMonth, isISODate, isLeapYear, type MissingDayReading } from './dates'
export { CLASS_DEFINITIONS, classEligibility, MISSING_DAY_READINGS, RULE_SET_INFO, RULE_SETS, ruleSetEdition } from './eligibility'
export { dayWords, unreachableNote } from './notes'
export { planWorkBack, ROLL_INTERVAL_DAYS } from './plan'
export { checkProfile, DEFAULT_ON_TRACK_SCORE, DEFAULT_PROFILE, DEFAULT_TOLERANCE_DAYS } from './profile'
export { assessDog, assessRegion, REGION_STATES } from './readiness'
export { isoWeek, isoWeekDate } from './weeks'
export { isWorkKind, WORK_KINDS } from './work'
