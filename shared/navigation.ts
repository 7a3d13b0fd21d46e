import type { Role } from './types/organisation'

/** One entry of the main navigation. */
export interface NavItem {
  to: string
  label: string
  /** Who sees it; the server enforces the same rule for the data behind it. */
  roles: readonly Role[]
  icon: 'home' | 'team' | 'settings' | 'organisations' | 'grid' | 'dog' | 'show' | 'profile' | 'board' | 'tasks' | 'mail' | 'weekly' | 'mailbox'
  /** Shown only while the app runs as the demo. */
  demoOnly?: boolean
}

const EVERYONE: readonly Role[] = ['manager', 'handler', 'assistant']

export const NAV_ITEMS: readonly NavItem[] = [
  { to: '/', label: 'Home', roles: EVERYONE, icon: 'home' },
  { to: '/tasks', label: 'My tasks', roles: ['assistant'], icon: 'tasks' },
  { to: '/grid', label: 'Coat grid', roles: ['manager', 'handler'], icon: 'grid' },
  { to: '/board', label: 'Week board', roles: ['manager', 'handler'], icon: 'board' },
  { to: '/dogs', label: 'Dogs', roles: EVERYONE, icon: 'dog' },
  { to: '/shows', label: 'Shows', roles: ['manager', 'handler'], icon: 'show' },
  { to: '/profiles', label: 'Coat profiles', roles: ['manager'], icon: 'profile' },
  { to: '/team', label: 'Team', roles: ['manager', 'handler'], icon: 'team' },
  { to: '/weekly', label: 'Weekly status', roles: ['manager'], icon: 'weekly' },
  { to: '/mail', label: 'Mail log', roles: ['manager'], icon: 'mail' },
  { to: '/mailbox', label: 'Demo mailbox', roles: ['manager'], icon: 'mailbox', demoOnly: true },
  { to: '/settings', label: 'Organisation', roles: ['manager'], icon: 'settings' },
]

/** The navigation a role sees, in its order; an assistant's own tasks come first. */
export function navigationFor(role: Role | null | undefined, demoMode = false): NavItem[] {
  if (!role) return []
  const items = NAV_ITEMS.filter(item => item.roles.includes(role) && (demoMode || !item.demoOnly))
  if (role !== 'assistant') return items
  const tasks = items.filter(item => item.to === '/tasks')
  return [...tasks, ...items.filter(item => item.to !== '/tasks')]
}

/** Whether a role may open a page whose meta lists `roles` (no list: everyone signed in). */
export function mayOpen(role: Role | null | undefined, roles?: readonly Role[]): boolean {
  if (!roles) return true
  return !!role && roles.includes(role)
}
