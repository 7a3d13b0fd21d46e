import type { H3Event } from 'h3'
import { getToken } from '#auth'
import type { Role } from '../../shared/types/organisation'
import { ROLE_LABELS } from '../../shared/types/organisation'

/** Who is asking: the signed-in user, their active organisation and their role in it, read fresh from the database. */
export interface Caller {
  userId: number
  name: string
  email: string
  organisationId: number
  organisationName: string
  timeZone: string
  ruleSet: string
  role: Role
}

/** What the signed session token carries. */
export interface BloomlineToken {
  userId?: number
  organisationId?: number | null
  sessionVersion?: number
}

/** The decoded session token, or a 401. */
export async function requireSignedIn(event: H3Event): Promise<Required<BloomlineToken>> {
  // The secret is passed, not left to nuxt-auth: it learns it only once its /api/auth route has
  // loaded in this process, so a fresh instance behind a load balancer would refuse good sessions.
  const token = await getToken({ event, secret: useRuntimeConfig().authSecret }) as BloomlineToken | null
  if (!token?.userId) throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Sign in to continue.' })
  return { userId: token.userId, organisationId: token.organisationId ?? null, sessionVersion: token.sessionVersion ?? 0 }
}

/**
 * The caller, or the error that stops them: 401 without a valid session, 403 without an active
 * organisation or when their role is not among `roles`. Role and membership are read from the
 * database on every request, so a change of role takes effect at once.
 */
export async function requireCaller(event: H3Event, roles?: readonly Role[]): Promise<Caller> {
  const cached = event.context.caller as Caller | undefined
  const caller = cached ?? await loadCaller(event)
  event.context.caller = caller
  if (roles && !roles.includes(caller.role)) {
    const allowed = roles.map(r => ROLE_LABELS[r].toLowerCase() + 's').join(' and ')
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `Only ${allowed} may do this.` })
  }
  return caller
}

/** The signed-in user's row and token, or a 401 when the session is missing or has been ended. */
export async function requireUser(event: H3Event) {
  const token = await requireSignedIn(event)
  const { User } = useModels()
  const user = await User.findByPk(token.userId)
  if (!user || user.sessionVersion !== token.sessionVersion) {
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Sign in again.' })
  }
  return { token, user }
}

async function loadCaller(event: H3Event): Promise<Caller> {
  const { token, user } = await requireUser(event)
  if (!token.organisationId) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Choose an organisation to work in first.' })
  }
  const caller = await callerFor(user.id, token.organisationId)
  if (!caller) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'You are no longer a member of that organisation. Choose another one.' })
  }
  return caller
}

/**
 * A person as a caller in an organisation, read fresh from the database, or null when they are not
 * (or no longer) a member: for work done on someone's behalf without a request of theirs, such as
 * a calendar feed or a weekly status, scoped exactly as their own requests would be.
 */
export async function callerFor(userId: number, organisationId: number): Promise<Caller | null> {
  const { Membership, Organisation, User } = useModels()
  const membership = await Membership.findOne({
    where: { userId, organisationId },
    include: [{ model: Organisation, as: 'organisation' }, { model: User, as: 'user' }],
  })
  if (!membership?.organisation || !membership.user) return null
  return {
    userId: membership.user.id,
    name: membership.user.name,
    email: membership.user.email,
    organisationId: membership.organisation.id,
    organisationName: membership.organisation.name,
    timeZone: membership.organisation.timeZone,
    ruleSet: membership.organisation.ruleSet,
    role: membership.role,
  }
}

/** A 404 that reads the same whether the thing never existed or belongs to another organisation. */
export function notFound(what: string) {
  return createError({ statusCode: 404, statusMessage: 'Not Found', message: `No such ${what}.` })
}
