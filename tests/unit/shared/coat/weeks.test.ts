import { afterEach, describe, expect, it } from 'vitest'
import { isoWeek, isoWeekDate } from '../../../../shared/coat'

// ISO 8601 week dates (the first three are DESIGN.md §6 and issue 3; the 2008 and 2010 ones
// are the standard's well-known year-boundary examples).
const CASES: [string, string][] = [
  ['2026-12-31', '2026-W53-4'],
  ['2027-01-04', '2027-W01-1'],
  ['2025-12-29', '2026-W01-1'],
  ['2027-01-03', '2026-W53-7'],
  ['2026-01-01', '2026-W01-4'],
  ['2024-12-30', '2025-W01-1'],
  ['2021-01-03', '2020-W53-7'],
  ['2008-12-29', '2009-W01-1'],
  ['2010-01-03', '2009-W53-7'],
]

describe('isoWeekDate', () => {
  it.each(CASES)('%s is %s', (date, week) => {
    expect(isoWeekDate(date)).toBe(week)
    expect(isoWeek(date)).toBe(week.slice(0, 8))
  })

  it('throws on an impossible date, naming it', () => {
    expect(() => isoWeekDate('2026-02-30')).toThrow('2026-02-30')
  })
})

describe('isoWeekDate in any time zone', () => {
  const original = process.env.TZ
  afterEach(() => {
    process.env.TZ = original
  })

  // Zones a day apart (UTC+14 and UTC-11), one with daylight saving, one at a 45-minute offset.
  it.each(['Pacific/Kiritimati', 'Pacific/Pago_Pago', 'America/Sao_Paulo', 'Asia/Kathmandu', 'UTC'])('%s', (zone) => {
    process.env.TZ = zone
    if (zone !== 'UTC') expect(new Date(2026, 0, 1).getTimezoneOffset()).not.toBe(0)
    for (const [date, week] of CASES) expect(isoWeekDate(date)).toBe(week)
  })
})
