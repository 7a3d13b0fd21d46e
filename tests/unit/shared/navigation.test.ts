import { describe, expect, it } from 'vitest'
import { mayOpen, navigationFor } from '../../../shared/navigation'

// The role table of the product design brief, section 2: a manager sees every section, a handler
// reads the team and assigns on the week board, an assistant sees their own tasks first (issue 6).
describe('navigationFor', () => {
  it.each([
    ['manager', ['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Coat profiles', 'Team', 'Weekly status', 'Mail log', 'Organisation']],
    ['handler', ['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Team']],
    ['assistant', ['My tasks', 'Home', 'Dogs']],
    [null, []],
  ] as const)('%s sees %j', (role, labels) => {
    expect(navigationFor(role).map(i => i.label)).toEqual(labels)
  })

  // Issue 7: the demo mailbox is a page for managers, shown only in demo mode.
  it('adds the demo mailbox for managers in demo mode only', () => {
    expect(navigationFor('manager', true).map(i => i.label)).toContain('Demo mailbox')
    expect(navigationFor('manager', false).map(i => i.label)).not.toContain('Demo mailbox')
    expect(navigationFor('handler', true).map(i => i.label)).not.toContain('Demo mailbox')
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
