import { addDays as addLocalDays, addMonths, format, getDate, parseISO } from 'date-fns'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { addDays, CLASS_DEFINITIONS, classEligibility, MISSING_DAY_READINGS, RULE_SETS, ruleSetEdition } from '../../../../shared/coat'
import type { RuleSet } from '../../../../shared/coat'

const check = (ruleSet: RuleSet, born: string, show: string, code: string) => {
  const found = classEligibility(ruleSet, born, show).find((c) => c.code === code)
  if (!found) throw new Error(`no class ${code}`)
  return found
}

describe('class lists', () => {
  it('hold the codes issue 3 names, and more', () => {
    const codes = RULE_SETS.flatMap((r) => CLASS_DEFINITIONS[r].map((c) => c.code))
    for (const code of ['akc:puppy', 'akc:puppy-6-9', 'akc:puppy-9-12', 'akc:12-18', 'kc:minor-puppy', 'kc:puppy', 'kc:junior', 'kc:yearling', 'fci:puppy', 'fci:junior', 'fci:intermediate', 'fci:open', 'fci:champion', 'fci:veteran']) {
      expect(codes).toContain(code)
    }
    expect(codes).toEqual(expect.arrayContaining(['akc:novice', 'akc:bred-by-exhibitor', 'akc:american-bred', 'akc:open', 'kc:post-graduate', 'kc:limit', 'kc:open', 'kc:veteran', 'fci:working']))
  })

  it.each(RULE_SETS)('%s codes are unique, "<rule set>:<class>" in lower case with hyphens, in the order checked', (ruleSet) => {
    const codes = CLASS_DEFINITIONS[ruleSet].map((c) => c.code)
    expect(new Set(codes).size).toBe(codes.length)
    for (const code of codes) expect(code).toMatch(new RegExp(`^${ruleSet.toLowerCase()}:[a-z0-9]+(-[a-z0-9]+)*$`))
    expect(classEligibility(ruleSet, '2020-01-01', '2026-01-01').map((c) => c.code)).toEqual(codes)
  })

  it.each(RULE_SETS)('%s names its rule text and defers to the show\'s own schedule', (ruleSet) => {
    expect(ruleSetEdition(ruleSet)).toMatch(/Regulations|Rules/)
    expect(ruleSetEdition(ruleSet)).toMatch(/(schedule|premium list).* decides?\b/)
  })

  // A note wherever the class asks more than age (AKC Ch. 3; KC Definitions of Classes; FCI
  // Dog Show Regulations; all from memory).
  it.each([
    ['FCI', 'fci:champion', /title/],
    ['FCI', 'fci:working', /working certificate/],
    ['AKC', 'akc:best-of-breed', /champion/],
    ['AKC', 'akc:novice', /wins/],
    ['KC', 'kc:limit', /wins/],
    ['AKC', 'akc:veterans', /premium list/],
  ] as [RuleSet, string, RegExp][])('%s %s carries a note', (ruleSet, code, note) => {
    expect(check(ruleSet, '2015-01-01', '2026-01-01', code).note).toMatch(note)
  })
})

describe('AKC (Rules Applying to Dog Shows, Ch. 3, from memory)', () => {
  // The rule's own 12-18 Month example: whelped January 1, eligible from January 1 of the next
  // year through a show whose first day is June 30, not July 1.
  it.each([
    ['2025-12-31', false],
    ['2026-01-01', true],
    ['2026-06-30', true],
    ['2026-07-01', false],
  ])('12-18 Month, whelped 2025-01-01, show on %s: %s', (show, eligible) => {
    expect(check('AKC', '2025-01-01', show, 'akc:12-18').eligible).toBe(eligible)
  })

  it.each([
    ['2025-06-30', 'akc:puppy', false],
    ['2025-07-01', 'akc:puppy', true],
    ['2025-07-01', 'akc:puppy-6-9', true],
    ['2025-07-01', 'akc:open', true],
    ['2025-06-30', 'akc:open', false],
    ['2025-09-30', 'akc:puppy-6-9', true],
    ['2025-10-01', 'akc:puppy-6-9', false],
    ['2025-10-01', 'akc:puppy-9-12', true],
    ['2025-12-31', 'akc:puppy', true],
    ['2026-01-01', 'akc:puppy', false],
    ['2031-12-31', 'akc:veterans', false],
    ['2032-01-01', 'akc:veterans', true],
  ])('whelped 2025-01-01, show on %s, %s: %s', (show, code, eligible) => {
    expect(check('AKC', '2025-01-01', show, code).eligible).toBe(eligible)
  })

  it('reads a missing day as the 1st of the next month: born 31 August, six months on 1 March', () => {
    expect(MISSING_DAY_READINGS.AKC).toBe('next-day')
    const feb = check('AKC', '2025-08-31', '2026-02-28', 'akc:puppy')
    expect(feb.eligible).toBe(false)
    expect(feb.note).toContain('2026-03-01')
    expect(feb.note).toContain('the other reading gives 2026-02-28')
    expect(check('AKC', '2025-08-31', '2026-03-01', 'akc:puppy')).toMatchObject({ eligible: true })
    expect(check('AKC', '2025-08-31', '2026-03-01', 'akc:puppy').note).not.toContain('other reading')
    expect(check('AKC', '2023-08-31', '2024-02-29', 'akc:puppy').eligible).toBe(false)
    expect(check('AKC', '2023-08-31', '2024-03-01', 'akc:puppy').eligible).toBe(true)
  })

  it('born 29 February: twelve months on 1 March of a common year', () => {
    expect(check('AKC', '2024-02-29', '2025-02-28', 'akc:puppy').eligible).toBe(true)
    expect(check('AKC', '2024-02-29', '2025-02-28', 'akc:12-18').eligible).toBe(false)
    expect(check('AKC', '2024-02-29', '2025-03-01', 'akc:puppy').eligible).toBe(false)
    expect(check('AKC', '2024-02-29', '2025-03-01', 'akc:12-18').eligible).toBe(true)
  })
})

describe('KC (Definitions of Classes; General Show Regulations, from memory)', () => {
  it.each([
    ['2025-07-14', 'kc:minor-puppy', false, undefined],
    ['2025-07-15', 'kc:minor-puppy', true, undefined],
    ['2025-07-15', 'kc:puppy', true, undefined],
    ['2025-07-15', 'kc:junior', true, undefined],
    ['2025-07-15', 'kc:open', true, undefined],
    ['2025-07-14', 'kc:open', false, undefined],
    ['2025-10-14', 'kc:minor-puppy', true, undefined],
    ['2025-10-15', 'kc:minor-puppy', true, /Exactly 9 months.*not exceeding 9 months/],
    ['2025-10-16', 'kc:minor-puppy', false, undefined],
    ['2026-01-15', 'kc:puppy', true, /Exactly 12 months/],
    ['2026-01-16', 'kc:puppy', false, undefined],
    ['2026-01-14', 'kc:yearling', false, undefined],
    ['2026-01-15', 'kc:yearling', true, undefined],
    ['2026-07-15', 'kc:junior', true, /Exactly 18 months/],
    ['2026-07-16', 'kc:junior', false, undefined],
    ['2027-01-15', 'kc:yearling', true, /Exactly 24 months/],
    ['2027-01-16', 'kc:yearling', false, undefined],
    ['2032-01-14', 'kc:veteran', false, undefined],
    ['2032-01-15', 'kc:veteran', true, undefined],
  ])('born 2025-01-15, show on %s, %s: %s', (show, code, eligible, note) => {
    const result = check('KC', '2025-01-15', show, code)
    expect(result.eligible).toBe(eligible)
    if (note) expect(result.note).toMatch(note)
    else expect(result.note ?? '').not.toMatch(/Exactly/)
  })

  it('reads a missing day as the last day of the month: born 31 August, six months on 28 February', () => {
    expect(MISSING_DAY_READINGS.KC).toBe('month-end')
    expect(check('KC', '2025-08-31', '2026-02-27', 'kc:minor-puppy').eligible).toBe(false)
    const feb = check('KC', '2025-08-31', '2026-02-28', 'kc:minor-puppy')
    expect(feb.eligible).toBe(true)
    expect(feb.note).toContain('the other reading gives 2026-03-01')
    expect(check('KC', '2023-08-31', '2024-02-29', 'kc:minor-puppy').eligible).toBe(true)
  })

  it('and the upper edge the same way: born 31 May, over nine months after 28 February', () => {
    const edge = check('KC', '2025-05-31', '2026-02-28', 'kc:minor-puppy')
    expect(edge).toMatchObject({ eligible: true })
    expect(edge.note).toMatch(/Exactly 9 months/)
    const after = check('KC', '2025-05-31', '2026-03-01', 'kc:minor-puppy')
    expect(after.eligible).toBe(false)
    expect(after.note).toContain('the other reading gives 2026-03-01')
  })

  it('nothing under six calendar months', () => {
    expect(classEligibility('KC', '2025-01-15', '2025-07-14').every((c) => !c.eligible)).toBe(true)
    expect(classEligibility('AKC', '2025-01-15', '2025-07-14').every((c) => !c.eligible)).toBe(true)
  })
})

describe('FCI (Dog Show Regulations, classes, from memory)', () => {
  it.each([
    ['2018-03-14', 'fci:veteran', false],
    ['2018-03-15', 'fci:veteran', true],
    ['2010-06-15', 'fci:minor-puppy', true],
    ['2010-06-14', 'fci:minor-puppy', false],
    ['2010-09-16', 'fci:minor-puppy', false],
    ['2010-09-15', 'fci:puppy', true],
    ['2010-12-14', 'fci:junior', false],
    ['2010-12-15', 'fci:junior', true],
    ['2011-06-14', 'fci:intermediate', false],
    ['2011-06-15', 'fci:intermediate', true],
    ['2011-06-15', 'fci:open', true],
    ['2011-06-15', 'fci:champion', true],
    ['2011-06-15', 'fci:working', true],
    ['2011-06-14', 'fci:open', false],
    ['2012-03-16', 'fci:intermediate', false],
  ])('born 2010-03-15, show on %s, %s: %s', (show, code, eligible) => {
    expect(check('FCI', '2010-03-15', show, code).eligible).toBe(eligible)
  })

  it('Veteran at exactly eight years', () => {
    expect(check('FCI', '2018-03-15', '2026-03-15', 'fci:veteran').eligible).toBe(true)
    expect(check('FCI', '2018-03-15', '2026-03-14', 'fci:veteran').eligible).toBe(false)
  })

  it('does not refuse the day a dog turns a class\'s upper age, and says so', () => {
    const edge = check('FCI', '2025-01-15', '2026-07-15', 'fci:junior')
    expect(edge.eligible).toBe(true)
    expect(edge.note).toMatch(/Turns 18 months.*check the schedule/)
    expect(check('FCI', '2025-01-15', '2026-07-16', 'fci:junior').eligible).toBe(false)
    expect(check('FCI', '2025-01-15', '2025-10-15', 'fci:puppy').note).toMatch(/Turns 9 months/)
    expect(check('FCI', '2025-01-15', '2025-10-15', 'fci:junior')).toMatchObject({ eligible: true })
  })

  it('reads a missing day as the last day of the month, 29 February included', () => {
    expect(MISSING_DAY_READINGS.FCI).toBe('month-end')
    expect(check('FCI', '2025-05-31', '2026-02-27', 'fci:junior').eligible).toBe(false)
    expect(check('FCI', '2025-05-31', '2026-02-28', 'fci:junior')).toMatchObject({ eligible: true })
    expect(check('FCI', '2092-02-29', '2100-02-28', 'fci:veteran').eligible).toBe(true)
  })
})

describe('classEligibility errors name the bad value', () => {
  it.each([
    ['UKC', '2025-01-01', '2026-01-01', 'UKC'],
    ['toString', '2025-01-01', '2026-01-01', 'toString'],
    ['AKC', '2025-02-29', '2026-01-01', '2025-02-29'],
    ['KC', '2025-01-01', '1 January', '1 January'],
  ])('%s, %s, %s', (ruleSet, born, show, named) => {
    expect(() => classEligibility(ruleSet as RuleSet, born, show)).toThrow(named)
  })
})

describe('month counting agrees with date-fns addMonths (which takes the month\'s last day)', () => {
  // date-fns works in local time; parseISO of a bare date is local midnight, so format gives it back.
  const months = (born: string, n: number, nextDay: boolean): string => {
    const date = parseISO(born)
    const later = addMonths(date, n)
    return format(nextDay && getDate(later) !== getDate(date) ? addLocalDays(later, 1) : later, 'yyyy-MM-dd')
  }
  const born = fc.integer({ min: 0, max: 4000 }).map((d) => addDays('2014-01-01', d))
  it('for every class of every rule set, on random birthdays and show days', () => {
    fc.assert(
      fc.property(born, fc.integer({ min: 0, max: 3500 }), fc.constantFrom(...RULE_SETS), (dob, age, ruleSet) => {
        const show = addDays(dob, age)
        const nextDay = MISSING_DAY_READINGS[ruleSet] === 'next-day'
        const checks = classEligibility(ruleSet, dob, show)
        CLASS_DEFINITIONS[ruleSet].forEach((def, i) => {
          const from = months(dob, def.minMonths, nextDay)
          const until = def.maxMonths === undefined ? '9999-12-31' : months(dob, def.maxMonths, nextDay)
          const expected = show >= from && (def.upper === 'under' ? show < until : show <= until)
          expect(checks[i]!.eligible).toBe(expected)
        })
      }),
      { numRuns: 500 },
    )
  })

  it('a date of birth after the show fits no class', () => {
    for (const ruleSet of RULE_SETS) expect(classEligibility(ruleSet, '2026-02-01', '2026-01-31').some((c) => c.eligible)).toBe(false)
  })
})
