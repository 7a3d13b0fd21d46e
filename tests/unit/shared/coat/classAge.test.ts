import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { addDays, CLASS_DEFINITIONS, classAgeWindow, classEligibility, isEligibleForClass, RULE_SETS } from '../../../../shared/coat'
import type { RuleSet } from '../../../../shared/coat'

const dayArb = (from: string, days: number) => fc.integer({ min: 0, max: days }).map(n => addDays(from, n))
const classArb = fc.constantFrom(...RULE_SETS).chain(ruleSet => fc.tuple(fc.constant(ruleSet), fc.constantFrom(...CLASS_DEFINITIONS[ruleSet].map(d => d.code))))

describe('one class by age', () => {
  // The edges below are the rule texts' own, as eligibility.test.ts cites them (from memory):
  // AKC 12-18 Month, whelped January 1, in from January 1 of the next year through a show on
  // June 30, not July 1; KC Junior "not exceeding eighteen calendar months", so still in on the
  // day the dog turns eighteen months; FCI Junior 9 to 18 months.
  it.each([
    ['AKC', 'akc:12-18', '2025-01-01', { from: '2026-01-01', through: '2026-06-30' }],
    ['KC', 'kc:junior', '2025-01-15', { from: '2025-07-15', through: '2026-07-15' }],
    ['KC', 'kc:open', '2025-01-15', { from: '2025-07-15', through: null }],
    ['FCI', 'fci:junior', '2025-01-15', { from: '2025-10-15', through: '2026-07-15' }],
    // Born 31 August: the AKC reads six months as 1 March, the KC as 28 February (Bloomline's readings, eligibility.ts).
    ['AKC', 'akc:puppy', '2025-08-31', { from: '2026-03-01', through: '2026-08-30' }],
    ['KC', 'kc:minor-puppy', '2025-08-31', { from: '2026-02-28', through: '2026-05-31' }],
  ] as [RuleSet, string, string, object][])('%s %s, born %s', (ruleSet, code, born, window) => {
    expect(classAgeWindow(ruleSet, code, born)).toEqual(window)
  })

  it.each([
    ['AKC', '2025-01-01', '2026-06-30', 'akc:12-18', true],
    ['AKC', '2025-01-01', '2026-07-01', 'akc:12-18', false],
    ['KC', '2025-01-15', '2025-07-14', 'kc:open', false],
    ['KC', '2025-01-15', '2032-01-15', 'kc:veteran', true],
  ] as [RuleSet, string, string, string, boolean][])('%s, born %s, show on %s, %s: %s', (ruleSet, born, show, code, eligible) => {
    expect(isEligibleForClass(ruleSet, born, show, code)).toBe(eligible)
  })

  it('answers as classEligibility does for every rule set, class, birth date and show day', () => {
    // Birth dates over several years, month ends and 29 February included; shows up to ten years on.
    fc.assert(fc.property(classArb, dayArb('2019-01-01', 7 * 366), fc.integer({ min: -30, max: 3700 }), ([ruleSet, code], born, after) => {
      const show = addDays(born, after)
      const expected = classEligibility(ruleSet, born, show).find(c => c.code === code)!.eligible
      expect(isEligibleForClass(ruleSet, born, show, code)).toBe(expected)
    }), { numRuns: 5000 })
  })

  it.each([
    [() => classAgeWindow('KC', 'akc:open', '2025-01-01'), /Unknown class "akc:open" for KC/],
    [() => classAgeWindow('XX' as RuleSet, 'kc:open', '2025-01-01'), /Unknown rule set "XX"/],
    [() => isEligibleForClass('KC', '2025-02-31', '2026-01-01', 'kc:open'), /Malformed date "2025-02-31"/],
    [() => isEligibleForClass('KC', '2025-01-01', '2026-13-01', 'kc:open'), /Malformed date "2026-13-01"/],
  ])('refuses what it cannot answer (%#)', (call, message) => {
    expect(call).toThrow(message)
  })
})
