import { describe, expect, it } from 'vitest'
import { mayOpen, navigationFor } from '../../../shared/navigation'

// The role table of the product design brief, section 2: a manager sees every section, a handler
// reads the team and assigns on the week board, an assistant sees their own tasks first (issue 6).
describe('navigationFor', () => {
  it.each([
    ['manager', ['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Coat profiles', 'Team', 'Organisation']],
    ['handler', ['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Team']],
    ['assistant', ['My tasks', 'Home', 'Dogs']],
    [null, []],
  ] as const)('%s sees %j', (role, labels) => {
    expect(navigationFor(role).map(i => i.label)).toEqual(labels)
  })
})

describe('mayOpen', () => {
  it.each([
    ['manager', ['manager'], true],
    ['handler', ['manager'], false],
    ['assistant', ['manager', 'handler'], false],
    ['assistant', undefined, true],
    [null, ['manager'], false],
  ] as const)('%s on a page for %j: %s', (role, roles, expected) => {
    expect(mayOpen(role, roles)).toBe(expected)
  })
})
