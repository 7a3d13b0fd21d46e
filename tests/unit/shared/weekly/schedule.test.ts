import { describe, expect, it } from 'vitest'
import { isoWeek } from '../../../../shared/coat'
import { addIsoWeeks, isIsoWeekKey, isoWeekMonday, isoWeekRange, nextWeeklySendAt, weeklyDue, weeklySendAt, type WeeklySchedule, type ZoneClock } from '../../../../shared/weekly'
import { todayInTimeZone, wallClockToInstant } from '../../../../server/utils/time'

// The zone clock the server hands in (server/utils/weeklySchedule.ts), built on server/utils/time.ts.
const weeklyClock: ZoneClock = { dateAt: (instant, timeZone) => todayInTimeZone(timeZone, instant), instantOf: wallClockToInstant }

// Daylight saving as the IANA zone data has it (from memory): Europe/London keeps GMT (UTC+0) in
// winter and BST (UTC+1) from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
// Sunday of October; America/New_York changes at 02:00 local on the second Sunday of March and
// the first Sunday of November; Pacific/Auckland is UTC+13 in its summer (December).
const monday7 = (timeZone: string, enabled = true): WeeklySchedule => ({ day: 1, hour: 7, timeZone, enabled })

describe('ISO 8601 week keys (DESIGN.md §6; ISO 8601 week dates)', () => {
  it.each([
    // 2026-12-31 is 2026-W53-4 and 2027-01-04 is 2027-W01-1 (DESIGN.md §6), so 2026 has 53 weeks.
    ['2026-W53', '2026-12-28'],
    ['2027-W01', '2027-01-04'],
    ['2026-W01', '2025-12-29'],
    ['2026-W49', '2026-11-30'],
    // The standard's well-known year-boundary examples: 2009-W01-1 is 2008-12-29, 2009-W53-7 is 2010-01-03.
    ['2009-W01', '2008-12-29'],
    ['2009-W53', '2009-12-28'],
  ])('%s starts on Monday %s', (week, monday) => {
    expect(isoWeekMonday(week)).toBe(monday)
    expect(isoWeek(monday)).toBe(week)
  })

  it('a week-53 year runs its last week into January', () => {
    expect(isoWeekRange('2026-W53')).toEqual({ start: '2026-12-28', end: '2027-01-03' })
    expect(isoWeek('2026-12-31')).toBe('2026-W53')
    expect(isoWeek('2027-01-04')).toBe('2027-W01')
    expect(addIsoWeeks('2026-W52', 1)).toBe('2026-W53')
    expect(addIsoWeeks('2026-W53', 1)).toBe('2027-W01')
    expect(addIsoWeeks('2027-W01', -1)).toBe('2026-W53')
  })

  it.each(['2027-W53', '2026-W00', '2026-W54', '2026-49', '2026-W4', ''])('%j is not a week', (key) => {
    expect(isIsoWeekKey(key)).toBe(false)
    expect(() => isoWeekMonday(key)).toThrow()
  })
})

describe('weeklySendAt', () => {
  it.each([
    // Monday 07:00 in London: GMT in winter, BST in summer.
    ['2026-W49', monday7('Europe/London'), '2026-11-30T07:00:00.000Z'],
    ['2027-W27', monday7('Europe/London'), '2027-07-05T06:00:00.000Z'],
    // Monday 07:00 in Auckland (NZDT, UTC+13) is Sunday evening in UTC.
    ['2026-W49', monday7('Pacific/Auckland'), '2026-11-29T18:00:00.000Z'],
    // Thursday of 2026-W53 is 2026-12-31, the last day of the year.
    ['2026-W53', { day: 4, hour: 9, timeZone: 'Europe/London', enabled: true }, '2026-12-31T09:00:00.000Z'],
    // Sunday of 2026-W53 is 3 January 2027.
    ['2026-W53', { day: 7, hour: 18, timeZone: 'America/New_York', enabled: true }, '2027-01-03T23:00:00.000Z'],
  ])('%s at %o is %s', (week, schedule, instant) => {
    expect(weeklySendAt(week, schedule, weeklyClock).toISOString()).toBe(instant)
  })

  it('an hour the spring change skips is read as just after the gap', () => {
    // 28 March 2027 is the last Sunday of March (2027-W12-7): London goes from 01:00 GMT to 02:00 BST.
    expect(weeklySendAt('2027-W12', { day: 7, hour: 1, timeZone: 'Europe/London' }, weeklyClock).toISOString()).toBe('2027-03-28T01:00:00.000Z')
    // 14 March 2027 (2027-W10-7) New York goes from 02:00 EST to 03:00 EDT: 02:00 lands at 03:00 EDT.
    expect(weeklySendAt('2027-W10', { day: 7, hour: 2, timeZone: 'America/New_York' }, weeklyClock).toISOString()).toBe('2027-03-14T07:00:00.000Z')
  })

  it('an hour the autumn change repeats is the first of the two', () => {
    // 25 October 2026 (2026-W43-7): 01:00 BST (00:00 UTC) comes first, then 01:00 GMT (01:00 UTC).
    expect(weeklySendAt('2026-W43', { day: 7, hour: 1, timeZone: 'Europe/London' }, weeklyClock).toISOString()).toBe('2026-10-25T00:00:00.000Z')
  })

  it('the hours either side of a change keep their own offsets', () => {
    const london = (hour: number) => weeklySendAt('2027-W12', { day: 7, hour, timeZone: 'Europe/London' }, weeklyClock).toISOString()
    expect(london(0)).toBe('2027-03-28T00:00:00.000Z')
    expect(london(2)).toBe('2027-03-28T01:00:00.000Z')
    expect(london(3)).toBe('2027-03-28T02:00:00.000Z')
  })
})

describe('weeklyDue', () => {
  it('is due once the week\'s send time has passed on the organisation\'s clock, and not a moment before', () => {
    const london = monday7('Europe/London')
    expect(weeklyDue(new Date('2026-11-30T06:59:59Z'), london, weeklyClock)).toMatchObject({ week: '2026-W49', due: false })
    expect(weeklyDue(new Date('2026-11-30T07:00:00Z'), london, weeklyClock)).toMatchObject({ week: '2026-W49', due: true })
    // Still due on Sunday night (a send missed while the app was down goes out late in the week) …
    expect(weeklyDue(new Date('2026-12-06T23:59:00Z'), london, weeklyClock)).toMatchObject({ week: '2026-W49', due: true })
    // … but on Monday before 07:00 the new week is not due yet, and the old one is never sent late.
    expect(weeklyDue(new Date('2026-12-07T06:00:00Z'), london, weeklyClock)).toMatchObject({ week: '2026-W50', due: false })
  })

  it('after the summer-time change the send is an hour earlier in UTC', () => {
    const london = monday7('Europe/London')
    // Monday 29 March 2027, the day after the change: 07:00 BST is 06:00 UTC.
    expect(weeklyDue(new Date('2027-03-29T05:59:00Z'), london, weeklyClock).due).toBe(false)
    expect(weeklyDue(new Date('2027-03-29T06:00:00Z'), london, weeklyClock)).toMatchObject({ week: '2027-W13', due: true })
  })

  it('takes the ISO week from the organisation\'s own calendar', () => {
    // Sunday 29 November 18:30 UTC is Monday 30 November 07:30 in Auckland: week 49 there, due; week 48 in London.
    const at = new Date('2026-11-29T18:30:00Z')
    expect(weeklyDue(at, monday7('Pacific/Auckland'), weeklyClock)).toMatchObject({ week: '2026-W49', due: true })
    expect(weeklyDue(at, monday7('Europe/London'), weeklyClock)).toMatchObject({ week: '2026-W48', due: true })
  })

  it('crosses into a new year by ISO week, not by calendar year', () => {
    // Sunday 3 January 2027 12:00 UTC: London is still in 2026-W53 (sent Monday 28 December);
    // Auckland is already on Monday 4 January 01:00, 2027-W01, before its 07:00 send.
    const at = new Date('2027-01-03T12:00:00Z')
    expect(weeklyDue(at, monday7('Europe/London'), weeklyClock)).toMatchObject({ week: '2026-W53', due: true })
    expect(weeklyDue(at, monday7('Pacific/Auckland'), weeklyClock)).toMatchObject({ week: '2027-W01', due: false })
  })

  it('is never due while the weekly status is off', () => {
    expect(weeklyDue(new Date('2026-12-02T12:00:00Z'), monday7('Europe/London', false), weeklyClock)).toMatchObject({ week: '2026-W49', due: false })
  })
})

describe('nextWeeklySendAt', () => {
  it('is this week\'s send time while it is ahead, else next week\'s', () => {
    const london = monday7('Europe/London')
    expect(nextWeeklySendAt(new Date('2026-11-30T06:00:00Z'), london, weeklyClock).toISOString()).toBe('2026-11-30T07:00:00.000Z')
    expect(nextWeeklySendAt(new Date('2026-12-01T23:00:00Z'), london, weeklyClock).toISOString()).toBe('2026-12-07T07:00:00.000Z')
    // From inside 2026-W52 the next Monday is the one of week 53.
    expect(nextWeeklySendAt(new Date('2026-12-22T10:00:00Z'), london, weeklyClock).toISOString()).toBe('2026-12-28T07:00:00.000Z')
  })
})
