import type { Membership, Organisation } from '../database/models'
import type { MemberView, OrganisationView } from '../../shared/types/organisation'

/** An organisation row as the API shows it. */
export function organisationView(o: Organisation): OrganisationView {
  return { id: o.id, name: o.name, kind: o.kind, timeZone: o.timeZone, ruleSet: o.ruleSet }
}

/** A membership row, with its user, as the team list shows it. */
export function memberView(m: Membership): MemberView {
  return {
    id: m.id,
    userId: m.userId,
    name: m.user?.name ?? '',
    email: m.user?.email ?? '',
    role: m.role,
    since: m.createdAt.toISOString(),
  }
}
