import { addCalendarMonths, addDays, toDayNumber } from './dates'
import { CLASS_DEFINITIONS, MISSING_DAY_READINGS, RULE_SETS } from './eligibility'
import type { ClassDefinition, ISODate, RuleSet } from './types'

/** The first days of a show on which a dog is in a class by age: from `from` through `through` (null: no upper age). */
export interface ClassAgeWindow {
  from: ISODate
  through: ISODate | null
}

// Each rule set's classes by code, built once: an import asks about the same few classes
// for thousands of rows.
const definitions = new Map<RuleSet, Map<string, ClassDefinition>>(RULE_SETS.map(r => [r, new Map(CLASS_DEFINITIONS[r].map(d => [d.code, d]))]))

function definition(ruleSet: RuleSet, code: string): ClassDefinition {
  const byCode = definitions.get(ruleSet)
  if (!byCode) throw new Error(`Unknown rule set ${JSON.stringify(ruleSet)}: expected one of ${RULE_SETS.join(', ')}`)
  const def = byCode.get(code)
  if (!def) throw new Error(`Unknown class ${JSON.stringify(code)} for ${ruleSet}`)
  return def
}

/**
 * The show first days on which a dog born on `dateOfBirth` is in one class by age, read as
 * classEligibility reads it (same month counting, same missing-day reading, same upper edge):
 * a dog is in exactly when `from <= firstDay` and (`through` is null or `firstDay <= through`).
 * Two date sums instead of the whole rule set's checks and notes, so a caller can keep the
 * window per dog and class and compare each show's first day as text.
 */
export function classAgeWindow(ruleSet: RuleSet, code: string, dateOfBirth: ISODate): ClassAgeWindow {
  const def = definition(ruleSet, code)
  const reading = MISSING_DAY_READINGS[ruleSet]
  const from = addCalendarMonths(dateOfBirth, def.minMonths, reading)
  if (def.maxMonths === undefined) return { from, through: null }
  const upper = addCalendarMonths(dateOfBirth, def.maxMonths, reading)
  // "Under" the upper age: out on the day the dog reaches it; the other readings keep that day.
  return { from, through: def.upper === 'under' ? addDays(upper, -1) : upper }
}

/** Whether a dog is in one class by age on the show's first day: classEligibility's `eligible` for that class alone. */
export function isEligibleForClass(ruleSet: RuleSet, dateOfBirth: ISODate, showFirstDay: ISODate, code: string): boolean {
  // A malformed first day throws, as classEligibility's does; ISO dates then compare as text.
  toDayNumber(showFirstDay)
  const { from, through } = classAgeWindow(ruleSet, code, dateOfBirth)
  return from <= showFirstDay && (through === null || showFirstDay <= through)
}
