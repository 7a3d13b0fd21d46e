export const ROLES = ['manager', 'handler', 'assistant'] as const
export type Role = typeof ROLES[number]

export const ORGANISATION_KINDS = ['kennel', 'club'] as const
export type OrganisationKind = typeof ORGANISATION_KINDS[number]

export const RULE_SET_NAMES = ['AKC', 'KC', 'FCI'] as const
export type RuleSet = typeof RULE_SET_NAMES[number]

export const ROLE_LABELS: Record<Role, string> = {
  manager: 'Manager',
  handler: 'Handler',
  assistant: 'Assistant',
}

export const RULE_SET_LABELS: Record<RuleSet, string> = {
  AKC: 'American Kennel Club',
  KC: 'The Kennel Club (UK)',
  FCI: 'Fédération Cynologique Internationale',
}

/** An organisation as the API returns it. */
export interface OrganisationView {
  id: number
  name: string
  kind: OrganisationKind
  timeZone: string
  ruleSet: RuleSet
}

/** One of the signed-in user's organisations, with their role in it. */
export interface MembershipView {
  organisation: OrganisationView
  role: Role
}

/** A member of the active organisation, as the team list shows them. */
export interface MemberView {
  id: number
  userId: number
  name: string
  email: string
  role: Role
  since: string
}

/** What `/api/me` answers. */
export interface MeView {
  user: { id: number, name: string, email: string }
  organisation: OrganisationView | null
  role: Role | null
  memberships: MembershipView[]
}
