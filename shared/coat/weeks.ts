import { getISODay, getISOWeek, getISOWeekYear } from 'date-fns'
import { toDayNumber } from './dates'
import type { ISODate } from './types'

function localNoon(date: ISODate): Date {
  toDayNumber(date)
  // date-fns reads a Date in the local time zone; local noon of the date's own day is that
  // day in every zone (midnight can be skipped by a daylight-saving change). setFullYear
  // keeps years below 100 from being read as 19xx.
  const noon = new Date(2000, 0, 1, 12)
  noon.setFullYear(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10)))
  return noon
}

/** The ISO 8601 week date of a calendar date, e.g. '2026-W53-4' for 2026-12-31. */
export function isoWeekDate(date: ISODate): string {
  const noon = localNoon(date)
  return `${isoWeekPart(noon)}-${getISODay(noon)}`
}

/** The ISO 8601 week of a calendar date, e.g. '2026-W53' for 2026-12-31 (the weekly status key). */
export function isoWeek(date: ISODate): string {
  return isoWeekPart(localNoon(date))
}

function isoWeekPart(noon: Date): string {
  return `${String(getISOWeekYear(noon)).padStart(4, '0')}-W${String(getISOWeek(noon)).padStart(2, '0')}`
}
