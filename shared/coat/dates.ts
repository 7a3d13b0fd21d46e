import type { ISODate } from './types'

function digitAt(value: string, at: number): number {
  const digit = value.charCodeAt(at) - 48
  return digit >= 0 && digit <= 9 ? digit : Number.NaN
}

/** Whether a year is a Gregorian leap year. */
export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0
}

/** The number of days in a month (1-12) of a year. */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return isLeapYear(year) ? 29 : 28
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31
}

// Dates are handled as whole day numbers (days since 1970-01-01), computed from the date's own
// year, month and day with integer arithmetic (H. Hinnant's days-from-civil and its inverse),
// so no clock, Date object or time zone can shift a day.
function civilToDay(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year
  const era = Math.floor(y / 400)
  const yoe = y - era * 400
  const doy = Math.floor((153 * (month > 2 ? month - 3 : month + 9) + 2) / 5) + day - 1
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy
  return era * 146097 + doe - 719468
}

function dayToCivil(dayNumber: number): [number, number, number] {
  const z = dayNumber + 719468
  const era = Math.floor(z / 146097)
  const doe = z - era * 146097
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365)
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100))
  const mp = Math.floor((5 * doy + 2) / 153)
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1
  const month = mp < 10 ? mp + 3 : mp - 9
  return [yoe + era * 400 + (month <= 2 ? 1 : 0), month, day]
}

// The day number of a 'YYYY-MM-DD' date, or NaN when it is not one (a non-digit makes NaN,
// and NaN fails every comparison below). Every work entry is read on every assessment.
function dayNumberOrNaN(value: unknown): number {
  if (typeof value !== 'string' || value.length !== 10 || value.charCodeAt(4) !== 45 || value.charCodeAt(7) !== 45) return Number.NaN
  const year = digitAt(value, 0) * 1000 + digitAt(value, 1) * 100 + digitAt(value, 2) * 10 + digitAt(value, 3)
  const month = digitAt(value, 5) * 10 + digitAt(value, 6)
  const day = digitAt(value, 8) * 10 + digitAt(value, 9)
  if (!(year >= 0 && month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month))) return Number.NaN
  return civilToDay(year, month, day)
}

/** Whether a value is a real calendar date written 'YYYY-MM-DD' (so '2027-02-31' is not). */
export function isISODate(value: unknown): value is ISODate {
  return !Number.isNaN(dayNumberOrNaN(value))
}

/** The day number of an ISO date; throws an Error naming the value when it is malformed or impossible. */
export function toDayNumber(value: ISODate): number {
  const dayNumber = dayNumberOrNaN(value)
  if (Number.isNaN(dayNumber)) throw new Error(`Malformed date ${JSON.stringify(value)}: expected a real calendar date written YYYY-MM-DD`)
  return dayNumber
}

// Formatting dates is most of what assessDog spends; a day always formats the same, so the
// strings are kept (a few years of days at most, and dropped wholesale past the cap).
const FORMATTED_CAP = 1 << 16
const formatted = new Map<number, ISODate>()

/** The ISO date of a day number. */
export function fromDayNumber(dayNumber: number): ISODate {
  let text = formatted.get(dayNumber)
  if (text === undefined) {
    const [year, month, day] = dayToCivil(dayNumber)
    text = `${String(year).padStart(4, '0')}-${month < 10 ? '0' : ''}${month}-${day < 10 ? '0' : ''}${day}`
    if (formatted.size >= FORMATTED_CAP) formatted.clear()
    formatted.set(dayNumber, text)
  }
  return text
}

/** The date a whole number of days after (or, if negative, before) a date. */
export function addDays(date: ISODate, days: number): ISODate {
  if (!Number.isInteger(days)) throw new Error(`Day count ${days} is not a whole number`)
  return fromDayNumber(toDayNumber(date) + days)
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: ISODate, to: ISODate): number {
  return toDayNumber(to) - toDayNumber(from)
}

/**
 * How a month count lands on a day that the target month lacks (31 August plus six
 * months has no 31 February): 'month-end' takes the last day of that month,
 * 'next-day' the first day of the month after.
 */
export type MissingDayReading = 'month-end' | 'next-day'

/** The date a whole number of calendar months after a date, to the same day of the month. */
export function addCalendarMonths(date: ISODate, months: number, missingDay: MissingDayReading): ISODate {
  if (!Number.isInteger(months)) throw new Error(`Month count ${months} is not a whole number`)
  const [fromYear, fromMonth, fromDay] = dayToCivil(toDayNumber(date))
  const index = fromYear * 12 + (fromMonth - 1) + months
  const year = Math.floor(index / 12)
  const month = index - year * 12 + 1
  const last = daysInMonth(year, month)
  if (fromDay <= last) return fromDayNumber(civilToDay(year, month, fromDay))
  return fromDayNumber(civilToDay(year, month, last) + (missingDay === 'next-day' ? 1 : 0))
}
