import { isISODate, type ISODate } from '../coat'

/** The order of day and month in a date like 05/06/2027: chosen once for the whole file. */
export type DayOrder = 'day-first' | 'month-first'

const MONTHS = ['jan', 'feb', 'mar', 'apr', 'may', 'jun', 'jul', 'aug', 'sep', 'oct', 'nov', 'dec']
const NUMERIC = /^(\d{1,2})[/.\-](\d{1,2})[/.\-](\d{4})$/
const YEAR_FIRST = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})$/
const DAY_NAMED = /^(\d{1,2})(?:st|nd|rd|th)?[\s\-]+([a-z]{3,9})\.?,?[\s\-]+(\d{4})$/
const NAMED_DAY = /^([a-z]{3,9})\.?[\s\-]+(\d{1,2})(?:st|nd|rd|th)?,?[\s\-]+(\d{4})$/

function monthNumber(word: string): number {
  const i = MONTHS.indexOf(word.slice(0, 3))
  // "Sept" and full names start with the same three letters; a longer word must still be the month's name.
  const full = ['january', 'february', 'march', 'april', 'may', 'june', 'july', 'august', 'september', 'october', 'november', 'december']
  return i >= 0 && (word.length === 3 || full[i]!.startsWith(word) || word === 'sept') ? i + 1 : 0
}

function iso(year: number, month: number, day: number): ISODate | null {
  if (year < 1900 || year > 2199) return null
  const text = `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`
  // isISODate checks the calendar too, so 2027-02-31 is not a date.
  return isISODate(text) ? text : null
}

/** Reads a date written as 2027-05-29, 29/05/2027 (or 05/29/2027, by `order`), 29 May 2027 or May 29, 2027; null when it is not one. */
export function readImportDate(value: string, order: DayOrder): ISODate | null {
  const text = value.trim().toLowerCase()
  let m = YEAR_FIRST.exec(text)
  if (m) return iso(Number(m[1]), Number(m[2]), Number(m[3]))
  m = NUMERIC.exec(text)
  if (m) {
    const [a, b] = [Number(m[1]), Number(m[2])]
    return order === 'day-first' ? iso(Number(m[3]), b, a) : iso(Number(m[3]), a, b)
  }
  m = DAY_NAMED.exec(text)
  if (m) return monthNumber(m[2]!) ? iso(Number(m[3]), monthNumber(m[2]!), Number(m[1])) : null
  m = NAMED_DAY.exec(text)
  if (m) return monthNumber(m[1]!) ? iso(Number(m[3]), monthNumber(m[1]!), Number(m[2])) : null
  return null
}

/**
 * The day/month order the values decide: a first number over 12 means day first, a second
 * number over 12 month first; null when no value decides (every one reads both ways) or they disagree.
 */
export function detectDayOrder(values: Iterable<string>): { order: DayOrder | null, conflict: boolean } {
  let dayFirst = false
  let monthFirst = false
  for (const value of values) {
    const m = NUMERIC.exec(value.trim())
    if (!m) continue
    if (Number(m[1]) > 12 && Number(m[2]) <= 12) dayFirst = true
    if (Number(m[2]) > 12 && Number(m[1]) <= 12) monthFirst = true
  }
  if (dayFirst && monthFirst) return { order: null, conflict: true }
  return { order: dayFirst ? 'day-first' : monthFirst ? 'month-first' : null, conflict: false }
}
