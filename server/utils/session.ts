import type { BloomlineToken } from './auth'
import type { Role } from '../../shared/types/organisation'

/** What the browser's session holds beside next-auth's own fields. */
export interface SessionExtras {
  user: { id: number, name: string, email: string }
  organisation: { id: number, name: string } | null
  role: Role | null
  organisationCount: number
}

/** The session as the browser sees it, read fresh so a role change shows at once; null when the token is stale. */
export async function describeSession(token: BloomlineToken): Promise<SessionExtras | null> {
  const { User, Membership, Organisation } = useModels()
  const user = await User.findByPk(token.userId)
  if (!user || user.sessionVersion !== (token.sessionVersion ?? 0)) return null
  const memberships = await Membership.findAll({ where: { userId: user.id }, include: [{ model: Organisation, as: 'organisation' }] })
  const active = memberships.find(m => m.organisationId === token.organisationId)
  return {
    user: { id: user.id, name: user.name, email: user.email },
    organisation: active?.organisation ? { id: active.organisation.id, name: active.organisation.name } : null,
    role: active?.role ?? null,
    organisationCount: memberships.length,
  }
}
