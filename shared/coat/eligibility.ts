import { addCalendarMonths, toDayNumber, type MissingDayReading } from './dates'
import type { ClassCheck, ClassDefinition, ISODate, RuleSet, RuleSetInfo } from './types'

export const RULE_SETS: readonly RuleSet[] = ['AKC', 'KC', 'FCI']

// The rule texts below are quoted and paraphrased from memory, not from a dated edition in
// front of us; each check defers to the show's own premium list or schedule, and says so.
export const RULE_SET_INFO: Record<RuleSet, RuleSetInfo> = {
  AKC: {
    key: 'AKC',
    label: 'American Kennel Club',
    edition: 'AKC Rules Applying to Dog Shows, Chapter 3 (classes); Bloomline has not checked these against a dated edition. The show\'s premium list decides.',
  },
  KC: {
    key: 'KC',
    label: 'The Kennel Club (UK)',
    edition: 'The Kennel Club (UK) Regulations, Definitions of Classes and General Show Regulations; Bloomline has not checked these against a dated edition. The show schedule decides.',
  },
  FCI: {
    key: 'FCI',
    label: 'Fédération Cynologique Internationale',
    edition: 'FCI Dog Show Regulations, classes; Bloomline has not checked these against a dated edition. The show schedule and the national kennel club\'s rules decide.',
  },
}

/**
 * How each rule set reads a month count that lands on a day the month lacks (born 31 August:
 * six months on 28/29 February, or on 1 March?). None of the three texts says, as far as we
 * recall, so these are Bloomline's readings; a class whose answer would differ under the other
 * reading gets a note.
 * - AKC: 'next-day' (1 March). The AKC counts age "up to and inclusive of the first day of a
 *   show" to the same day of the month (Ch. 3, the 12-18 Month example, from memory); a dog born
 *   on the 31st has not lived to "the 31st" until February is over. It is also the safe side of
 *   the six-month minimum, where a wrong entry costs the win.
 * - KC: 'month-end' (28/29 February). "Calendar months" read with the corresponding-date rule
 *   of English law: a period of months that would end on a day the month lacks ends on its
 *   last day (Dodds v Walker [1981], from memory).
 * - FCI: 'month-end' (28/29 February), the everyday calendar reckoning (and date-fns addMonths);
 *   the FCI text leaves the day count to the national kennel clubs.
 */
export const MISSING_DAY_READINGS: Record<RuleSet, MissingDayReading> = {
  AKC: 'next-day',
  KC: 'month-end',
  FCI: 'month-end',
}

const YEAR = 12

// AKC Rules Applying to Dog Shows, Chapter 3 (from memory): age "calculated up to and inclusive
// of the first day of a show"; no dog under six months in the regular classes. Upper bounds are
// "under", and the rule's own example (whelped January 1: 12-18 Month through a show whose first
// day is June 30 of the next year, not July 1) makes the edge clear: the day the dog reaches the
// upper age it is out.
const AKC_CLASSES: ClassDefinition[] = [
  { code: 'akc:puppy', label: 'Puppy', minMonths: 6, maxMonths: 12, upper: 'under', note: 'Also asks that the dog is not a champion (from memory).' },
  { code: 'akc:puppy-6-9', label: 'Puppy, 6-9 Months', minMonths: 6, maxMonths: 9, upper: 'under', note: 'A division of Puppy, where the club offers it; not a champion (from memory).' },
  { code: 'akc:puppy-9-12', label: 'Puppy, 9-12 Months', minMonths: 9, maxMonths: 12, upper: 'under', note: 'A division of Puppy, where the club offers it; not a champion (from memory).' },
  { code: 'akc:12-18', label: '12-18 Month', minMonths: 12, maxMonths: 18, upper: 'under', note: 'Also asks that the dog is not a champion (from memory).' },
  { code: 'akc:novice', label: 'Novice', minMonths: 6, note: 'Also limited by wins: not three firsts in Novice, no first in Bred-by-Exhibitor, American-bred or Open, and no championship points before entries close (from memory).' },
  { code: 'akc:amateur-owner-handler', label: 'Amateur-Owner-Handler', minMonths: 6, note: 'Also asks that the dog is not a champion and is handled by its registered owner, an amateur (from memory).' },
  { code: 'akc:bred-by-exhibitor', label: 'Bred-by-Exhibitor', minMonths: 6, note: 'Also asks that the dog is not a champion and is shown by a breeder who owns it (from memory).' },
  { code: 'akc:american-bred', label: 'American-bred', minMonths: 6, note: 'Also asks that the dog was whelped in the USA from a mating there and is not a champion (from memory).' },
  { code: 'akc:open', label: 'Open', minMonths: 6 },
  { code: 'akc:best-of-breed', label: 'Best of Breed', minMonths: 6, note: 'Entered by champions of record, or dogs that have completed a championship (from memory).' },
  { code: 'akc:veterans', label: 'Veterans', minMonths: 7 * YEAR, note: 'A non-regular class: the club sets its age in the premium list; 7 years and over is usual (from memory).' },
]

// The Kennel Club (UK) Regulations, Definitions of Classes (from memory): "For dogs of six and
// not exceeding nine calendar months of age on the first day of the Show" (Minor Puppy), and
// likewise Puppy (twelve), Junior (eighteen), Yearling (twelve to twenty-four); Veteran "not
// less than seven years of age on the first day of the Show"; the other classes are set by
// wins, not age. General Show Regulations: no dog under six calendar months may be shown.
// "Not exceeding nine" is read as still in on the day the dog turns nine months (it is then
// exactly nine, not over); the text does not settle that day, so it carries a note.
const KC_WINS = 'Also limited by the dog\'s wins; see the schedule\'s definition (from memory).'
const KC_CLASSES: ClassDefinition[] = [
  { code: 'kc:minor-puppy', label: 'Minor Puppy', minMonths: 6, maxMonths: 9, upper: 'not-exceeding' },
  { code: 'kc:puppy', label: 'Puppy', minMonths: 6, maxMonths: 12, upper: 'not-exceeding' },
  { code: 'kc:junior', label: 'Junior', minMonths: 6, maxMonths: 18, upper: 'not-exceeding' },
  { code: 'kc:yearling', label: 'Yearling', minMonths: 12, maxMonths: 24, upper: 'not-exceeding' },
  { code: 'kc:special-beginners', label: 'Special Beginners', minMonths: 6, note: 'Also limited by the exhibitor\'s and the dog\'s wins; see the schedule\'s definition (from memory).' },
  { code: 'kc:novice', label: 'Novice', minMonths: 6, note: KC_WINS },
  { code: 'kc:undergraduate', label: 'Undergraduate', minMonths: 6, note: KC_WINS },
  { code: 'kc:graduate', label: 'Graduate', minMonths: 6, note: KC_WINS },
  { code: 'kc:post-graduate', label: 'Post Graduate', minMonths: 6, note: KC_WINS },
  { code: 'kc:mid-limit', label: 'Mid Limit', minMonths: 6, note: KC_WINS },
  { code: 'kc:limit', label: 'Limit', minMonths: 6, note: KC_WINS },
  { code: 'kc:open', label: 'Open', minMonths: 6 },
  { code: 'kc:veteran', label: 'Veteran', minMonths: 7 * YEAR },
]

// FCI Dog Show Regulations, classes (from memory): Puppy 6-9 months, Junior 9-18, Intermediate
// 15-24, Open from 15, Working from 15 (with a working certificate), Champion from 15 (with a
// champion title), Veteran from 8 years; some shows add a Minor Puppy class of 3-6 months.
// "From 9 to 18 months" does not say whether the day the dog turns 18 months is in, so that
// day is not refused and carries a note.
const FCI_CLASSES: ClassDefinition[] = [
  { code: 'fci:minor-puppy', label: 'Minor Puppy', minMonths: 3, maxMonths: 6, upper: 'to', note: 'An optional class: only where the show schedule offers it.' },
  { code: 'fci:puppy', label: 'Puppy', minMonths: 6, maxMonths: 9, upper: 'to' },
  { code: 'fci:junior', label: 'Junior', minMonths: 9, maxMonths: 18, upper: 'to' },
  { code: 'fci:intermediate', label: 'Intermediate', minMonths: 15, maxMonths: 24, upper: 'to' },
  { code: 'fci:open', label: 'Open', minMonths: 15 },
  { code: 'fci:working', label: 'Working', minMonths: 15, note: 'Also needs a working certificate for the breed, sent with the entry (from memory).' },
  { code: 'fci:champion', label: 'Champion', minMonths: 15, note: 'Also needs a national or international champion title recognised by the FCI, proved with the entry (from memory).' },
  { code: 'fci:veteran', label: 'Veteran', minMonths: 8 * YEAR },
]

export const CLASS_DEFINITIONS: Record<RuleSet, readonly ClassDefinition[]> = {
  AKC: AKC_CLASSES,
  KC: KC_CLASSES,
  FCI: FCI_CLASSES,
}

/** The rule text and edition a rule set's checks follow, deferring to the show's own schedule. */
export function ruleSetEdition(ruleSet: RuleSet): string {
  return ruleSetInfo(ruleSet).edition
}

function ruleSetInfo(ruleSet: RuleSet): RuleSetInfo {
  if (!RULE_SETS.includes(ruleSet)) throw new Error(`Unknown rule set ${JSON.stringify(ruleSet)}: expected one of ${RULE_SETS.join(', ')}`)
  return RULE_SET_INFO[ruleSet]
}

const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']

function ageWords(months: number): string {
  return months % YEAR === 0 && months >= 3 * YEAR ? `${months / YEAR} years` : `${months} months`
}

function inClass(def: ClassDefinition, dateOfBirth: ISODate, show: number, reading: MissingDayReading): boolean {
  if (show < toDayNumber(addCalendarMonths(dateOfBirth, def.minMonths, reading))) return false
  if (def.maxMonths === undefined) return true
  const upper = toDayNumber(addCalendarMonths(dateOfBirth, def.maxMonths, reading))
  return def.upper === 'under' ? show < upper : show <= upper
}

function upperEdgeNote(def: ClassDefinition): string {
  const age = ageWords(def.maxMonths!)
  return def.upper === 'not-exceeding'
    ? `Exactly ${age} on the first day of the show: "not exceeding ${age}" is read as still in; check the schedule.`
    : `Turns ${age} on the first day of the show, the class's upper edge; the regulation does not say whether that day is in, so it is not refused here; check the schedule.`
}

function missingDayNote(ruleSet: RuleSet, def: ClassDefinition, dateOfBirth: ISODate, show: ISODate, reading: MissingDayReading, other: MissingDayReading): string {
  const day = Number(dateOfBirth.slice(8, 10))
  const bounds = [def.minMonths, def.maxMonths].filter((m): m is number => m !== undefined)
  // The bound whose two readings fall either side of (or on) the show's first day.
  const months = bounds.find((m) => {
    const a = addCalendarMonths(dateOfBirth, m, reading)
    const b = addCalendarMonths(dateOfBirth, m, other)
    return a !== b && show >= (a < b ? a : b) && show <= (a < b ? b : a)
  })!
  const ours = addCalendarMonths(dateOfBirth, months, reading)
  const theirs = addCalendarMonths(dateOfBirth, months, other)
  const target = addCalendarMonths(dateOfBirth, months, 'month-end')
  const monthName = `${MONTH_NAMES[Number(target.slice(5, 7)) - 1]} ${target.slice(0, 4)}`
  return `Born on day ${day} of a month; ${monthName} has no day ${day}, so ${ruleSet} is read here as reaching ${ageWords(months)} on ${ours} (the other reading gives ${theirs}); check the schedule.`
}

/** Age-only eligibility of a dog for each class of a rule set, counted to the first day of the show. */
export function classEligibility(ruleSet: RuleSet, dateOfBirth: ISODate, showFirstDay: ISODate): ClassCheck[] {
  ruleSetInfo(ruleSet)
  toDayNumber(dateOfBirth)
  const show = toDayNumber(showFirstDay)
  const reading = MISSING_DAY_READINGS[ruleSet]
  const other: MissingDayReading = reading === 'month-end' ? 'next-day' : 'month-end'
  return CLASS_DEFINITIONS[ruleSet].map((def) => {
    const eligible = inClass(def, dateOfBirth, show, reading)
    const notes: string[] = []
    if (def.note) notes.push(def.note)
    if (
      eligible
      && def.maxMonths !== undefined
      && def.upper !== 'under'
      && show === toDayNumber(addCalendarMonths(dateOfBirth, def.maxMonths, reading))
    ) {
      notes.push(upperEdgeNote(def))
    }
    if (inClass(def, dateOfBirth, show, other) !== eligible) notes.push(missingDayNote(ruleSet, def, dateOfBirth, showFirstDay, reading, other))
    const check: ClassCheck = { code: def.code, label: def.label, eligible }
    if (notes.length) check.note = notes.join(' ')
    return check
  })
}
