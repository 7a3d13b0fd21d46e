import { addDays, daysBetween, type ISODate } from '../../shared/coat'

// Explicit imports only: the bench and scripts load these helpers outside Nitro.

interface WallClock { year: number, month: number, day: number, hour: number, minute: number, second: number }

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    })
    formatters.set(timeZone, f)
  }
  return f
}

function wallClockAt(instant: number, timeZone: string): WallClock {
  const out: WallClock = { year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0 }
  for (const part of formatter(timeZone).formatToParts(new Date(instant))) {
    if (part.type in out) out[part.type as keyof WallClock] = Number(part.value)
  }
  return out
}

const pad = (n: number, width = 2) => String(n).padStart(width, '0')

function dateOf(clock: WallClock): ISODate {
  return `${pad(clock.year, 4)}-${pad(clock.month)}-${pad(clock.day)}`
}

/** The milliseconds a zone's wall clock is ahead of UTC at an instant. */
function offsetAt(instant: number, timeZone: string): number {
  const c = wallClockAt(instant, timeZone)
  const asUtc = Date.UTC(c.year, c.month - 1, c.day, c.hour, c.minute, c.second)
  return asUtc - Math.floor(instant / 1000) * 1000
}

/** Today's calendar date in a time zone ("today" is the organisation's date, DESIGN.md §2). */
export function todayInTimeZone(timeZone: string, now: Date = new Date()): ISODate {
  return dateOf(wallClockAt(now.getTime(), timeZone))
}

/** An instant as a zone's wall clock: its date and its time HH:mm. */
export function instantToWallClock(instant: Date, timeZone: string): { date: ISODate, time: string } {
  const c = wallClockAt(instant.getTime(), timeZone)
  return { date: dateOf(c), time: `${pad(c.hour)}:${pad(c.minute)}` }
}

/**
 * The UTC instant of a date and time HH:mm on a zone's wall clock. Where a clock change makes
 * the time happen twice it is the first of the two (entries close at the earlier one); where the
 * time is skipped it is read with the offset from before the change, so it lands just after the gap.
 */
export function wallClockToInstant(date: ISODate, time: string, timeZone: string): Date {
  const [year, month, day] = date.split('-').map(Number) as [number, number, number]
  const [hour, minute] = time.split(':').map(Number) as [number, number]
  const local = Date.UTC(year, month - 1, day, hour, minute)
  const DAY = 86_400_000
  const offsets = [...new Set([offsetAt(local - DAY, timeZone), offsetAt(local + DAY, timeZone)])]
  const candidates = offsets.map(o => local - o).sort((a, b) => a - b)
  const exact = candidates.find((instant) => {
    const back = instantToWallClock(new Date(instant), timeZone)
    return back.date === date && back.time === time
  })
  return new Date(exact ?? local - offsets[0]!)
}

/** Monday of the ISO 8601 week a date falls in (weeks run Monday to Sunday). */
export function isoWeekMonday(date: ISODate): ISODate {
  // 1970-01-01 was a Thursday: day 0 is ISO weekday 4, so (n + 3) mod 7 counts from Monday.
  const n = daysBetween('1970-01-01', date)
  return addDays(date, -(((n + 3) % 7) + 7) % 7)
}

/** `count` Mondays starting with the first on or after `date`. */
export function comingMondays(date: ISODate, count: number): ISODate[] {
  const monday = isoWeekMonday(date)
  const first = monday === date ? date : addDays(monday, 7)
  return Array.from({ length: count }, (_, i) => addDays(first, 7 * i))
}
