import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { addCalendarMonths, addDays, daysBetween, isISODate } from '../../../../shared/coat'

describe('isISODate', () => {
  // ISO 8601 calendar dates, extended format YYYY-MM-DD, with the Gregorian leap-year rule.
  it.each([
    ['2026-01-05', true],
    ['2024-02-29', true],
    ['2000-02-29', true],
    ['2025-02-29', false],
    ['2100-02-29', false],
    ['2027-02-31', false],
    ['2026-04-31', false],
    ['2026-13-01', false],
    ['2026-00-10', false],
    ['2026-01-00', false],
    ['2026-1-05', false],
    ['20260105', false],
    [' 2026-01-05', false],
    ['2026-01-05T00:00', false],
    ['', false],
    [20260105, false],
    [null, false],
  ])('%j is a date: %s', (value, expected) => {
    expect(isISODate(value)).toBe(expected)
  })
})

describe('addDays and daysBetween', () => {
  // Gregorian calendar arithmetic (ISO 8601); the 70-day span is DESIGN.md §4's ten weeks.
  it.each([
    ['2026-01-05', 1, '2026-01-06'],
    ['2026-01-31', 1, '2026-02-01'],
    ['2024-02-28', 1, '2024-02-29'],
    ['2025-02-28', 1, '2025-03-01'],
    ['2025-12-31', 1, '2026-01-01'],
    ['2026-03-01', -1, '2026-02-28'],
    ['2026-09-12', -70, '2026-07-04'],
    ['1999-12-31', 366, '2000-12-31'],
    ['1969-12-31', 1, '1970-01-01'],
  ])('%s %+d days is %s', (from, days, to) => {
    expect(addDays(from, days)).toBe(to)
    expect(daysBetween(from, to)).toBe(days)
  })

  it('throws on a malformed or impossible date, naming it', () => {
    expect(() => addDays('2027-02-31', 1)).toThrow('2027-02-31')
    expect(() => daysBetween('2026-01-05', '5 January')).toThrow('5 January')
    expect(() => addDays('2026-01-05', 1.5)).toThrow('1.5')
  })

  it('agrees with Date.UTC on every day from 1900 to 2200', () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(1900, 0, 1) / 864e5, max: Date.UTC(2200, 11, 31) / 864e5 }), fc.integer({ min: -4000, max: 4000 }), (n, step) => {
        const iso = new Date(n * 864e5).toISOString().slice(0, 10)
        const later = new Date((n + step) * 864e5).toISOString().slice(0, 10)
        expect(isISODate(iso)).toBe(true)
        expect(addDays(iso, step)).toBe(later)
        expect(daysBetween(iso, later)).toBe(step)
      }),
      { numRuns: 500 },
    )
  })
})

describe('addCalendarMonths', () => {
  // DESIGN.md §5: a month is counted to the same day of the month; where that day does not
  // exist, 'month-end' takes the month's last day and 'next-day' the 1st of the next month.
  it.each([
    ['2025-01-01', 6, '2025-07-01', '2025-07-01'],
    ['2025-01-15', 9, '2025-10-15', '2025-10-15'],
    ['2025-08-31', 6, '2026-02-28', '2026-03-01'],
    ['2023-08-31', 6, '2024-02-29', '2024-03-01'],
    ['2025-08-30', 6, '2026-02-28', '2026-03-01'],
    ['2025-08-28', 6, '2026-02-28', '2026-02-28'],
    ['2025-01-31', 1, '2025-02-28', '2025-03-01'],
    ['2025-03-31', 6, '2025-09-30', '2025-10-01'],
    ['2024-02-29', 12, '2025-02-28', '2025-03-01'],
    ['2024-02-29', 48, '2028-02-29', '2028-02-29'],
    ['2026-03-31', -1, '2026-02-28', '2026-03-01'],
    ['2025-12-31', 2, '2026-02-28', '2026-03-01'],
  ])('%s + %d months: %s (month-end), %s (next day)', (from, months, monthEnd, nextDay) => {
    expect(addCalendarMonths(from, months, 'month-end')).toBe(monthEnd)
    expect(addCalendarMonths(from, months, 'next-day')).toBe(nextDay)
  })
})
