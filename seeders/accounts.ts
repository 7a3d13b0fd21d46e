import type { OrganisationKind, Role, RuleSet } from '../shared/types/organisation'

// Every kennel, club, person and address below is invented for the demo. Addresses use the
// reserved `.example` domain (RFC 2606, section 3), so no mail can reach a real person.

export interface DemoAccount { name: string, email: string, password: string, memberships: { organisation: string, role: Role }[] }

export const DEMO_ORGANISATIONS: { name: string, kind: OrganisationKind, timeZone: string, ruleSet: RuleSet }[] = [
  { name: 'Larkspur Hollow Kennel', kind: 'kennel', timeZone: 'Europe/London', ruleSet: 'KC' },
  { name: 'Northfold Wire Terrier Club', kind: 'club', timeZone: 'Europe/Dublin', ruleSet: 'FCI' },
]

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { name: 'Maren Oakhurst', email: 'maren@larkspur.example', password: 'larkspur-manager', memberships: [{ organisation: 'Larkspur Hollow Kennel', role: 'manager' }, { organisation: 'Northfold Wire Terrier Club', role: 'handler' }] },
  { name: 'Tobias Wrenfield', email: 'tobias@larkspur.example', password: 'larkspur-handler', memberships: [{ organisation: 'Larkspur Hollow Kennel', role: 'handler' }] },
  { name: 'Ines Calloway', email: 'ines@larkspur.example', password: 'larkspur-handler2', memberships: [{ organisation: 'Larkspur Hollow Kennel', role: 'handler' }] },
  { name: 'Pip Adeyemi-Rowe', email: 'pip@larkspur.example', password: 'larkspur-assistant', memberships: [{ organisation: 'Larkspur Hollow Kennel', role: 'assistant' }] },
  { name: 'Juno Marchbank', email: 'juno@larkspur.example', password: 'larkspur-assistant2', memberships: [{ organisation: 'Larkspur Hollow Kennel', role: 'assistant' }] },
  { name: 'Corrie Vantongeren', email: 'corrie@northfold.example', password: 'northfold-manager', memberships: [{ organisation: 'Northfold Wire Terrier Club', role: 'manager' }] },
]

