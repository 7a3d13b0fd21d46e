import { addDays, daysBetween, isoWeek, type ISODate } from '../coat'

// When each organisation's weekly status is due. Pure: the conversion between an instant and a
// zone's wall clock is handed in (the server passes server/utils/time.ts, whose Intl-based
// reading decides what a skipped or doubled hour means), so this file holds only the calendar.

/** ISO 8601 weekday numbers, Monday first. */
export const ISO_WEEKDAYS = [1, 2, 3, 4, 5, 6, 7] as const

/** The name of each ISO weekday (index 0 is Monday, ISO day 1). */
export const WEEKDAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const

/** The organisation's default: Monday at 07:00 on its own clock (DESIGN.md §3). */
export const DEFAULT_WEEKLY_DAY = 1
export const DEFAULT_WEEKLY_HOUR = 7

/** An organisation's weekly-status settings as the schedule reads them. */
export interface WeeklySchedule {
  /** ISO weekday, 1 = Monday … 7 = Sunday. */
  day: number
  /** Hour 0–23 on the organisation's wall clock. */
  hour: number
  timeZone: string
  enabled: boolean
}

/** How to move between instants and a zone's wall clock. */
export interface ZoneClock {
  /** The zone's calendar date at an instant. */
  dateAt(instant: Date, timeZone: string): ISODate
  /** The instant of a date and time HH:mm on the zone's wall clock. */
  instantOf(date: ISODate, time: string, timeZone: string): Date
}

const WEEK_KEY = /^(\d{4})-W(\d{2})$/

/** Whether a value is an ISO 8601 week key such as `2026-W53` that exists (2027 has no week 53). */
export function isIsoWeekKey(value: unknown): value is string {
  if (typeof value !== 'string' || !WEEK_KEY.test(value)) return false
  try {
    isoWeekMonday(value)
    return true
  }
  catch {
    return false
  }
}

/** The Monday of an ISO 8601 week key (`2026-W53` → 2026-12-28); throws on a week its year lacks. */
export function isoWeekMonday(week: string): ISODate {
  const match = WEEK_KEY.exec(week)
  if (!match) throw new Error(`Expected an ISO week such as 2026-W49, got ${JSON.stringify(week)}`)
  // ISO 8601: week 1 is the week that holds 4 January. 1970-01-01 was a Thursday, so
  // (days since then + 3) mod 7 counts a date's weekday from Monday = 0.
  const jan4 = `${match[1]}-01-04`
  const fromMonday = (((daysBetween('1970-01-01', jan4) + 3) % 7) + 7) % 7
  const monday = addDays(addDays(jan4, -fromMonday), 7 * (Number(match[2]) - 1))
  if (isoWeek(monday) !== week) throw new Error(`${week} is not a week of ${match[1]}`)
  return monday
}

/** The first and last day (Monday and Sunday) of an ISO week. */
export function isoWeekRange(week: string): { start: ISODate, end: ISODate } {
  const start = isoWeekMonday(week)
  return { start, end: addDays(start, 6) }
}

/** The ISO week `weeks` after (or before, when negative) another. */
export function addIsoWeeks(week: string, weeks: number): string {
  return isoWeek(addDays(isoWeekMonday(week), 7 * weeks))
}

/** The ISO week number alone (`2026-W53` → 53), as people say it. */
export function isoWeekNumber(week: string): number {
  return Number(week.slice(6))
}

/** The instant a week's status is due: the chosen weekday and hour of that week on the organisation's clock. */
export function weeklySendAt(week: string, schedule: Pick<WeeklySchedule, 'day' | 'hour' | 'timeZone'>, clock: ZoneClock): Date {
  const date = addDays(isoWeekMonday(week), schedule.day - 1)
  return clock.instantOf(date, `${String(schedule.hour).padStart(2, '0')}:00`, schedule.timeZone)
}

/** Where an organisation stands at an instant: the ISO week on its own calendar, that week's send time, and whether it has come. */
export interface WeeklyDue {
  week: string
  sendAt: Date
  /** Enabled, and the send time of the current week has passed. */
  due: boolean
}

/**
 * The organisation's current ISO week (of the date on its own clock, so Monday in Auckland can be
 * Sunday in London) and whether its status for that week is due. A week whose send time was
 * missed (the app was down) is still due until the week ends; a past week is never sent late.
 */
export function weeklyDue(now: Date, schedule: WeeklySchedule, clock: ZoneClock): WeeklyDue {
  const week = isoWeek(clock.dateAt(now, schedule.timeZone))
  const sendAt = weeklySendAt(week, schedule, clock)
  return { week, sendAt, due: schedule.enabled && now.getTime() >= sendAt.getTime() }
}

/** The next send time after `now`: this week's when it is still ahead, else next week's. */
export function nextWeeklySendAt(now: Date, schedule: Omit<WeeklySchedule, 'enabled'>, clock: ZoneClock): Date {
  const { week, sendAt } = weeklyDue(now, { ...schedule, enabled: true }, clock)
  return sendAt.getTime() > now.getTime() ? sendAt : weeklySendAt(addIsoWeeks(week, 1), schedule, clock)
}
