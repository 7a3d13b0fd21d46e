import { createHash, randomBytes } from 'node:crypto'
import { Op, type Transaction } from 'sequelize'
import type { z } from 'zod'
import { normaliseEmail } from '../../shared/auth'
import { invitationMail } from '../../shared/mail/invitation'
import { INVITATION_DAYS } from '../../shared/schemas/invitations'
import type { InvitationLinkStatus, InvitationLookupView, InvitationView } from '../../shared/types/invitations'
import type { OutboxStatus } from '../../shared/types/mail'
import type { Role } from '../../shared/types/organisation'
import type { Invitation, Organisation, User } from '../database/models'
import type { Caller } from './auth'
import { appUrl, cancelWaitingMail, queueMail } from './mail'

/** A new secret for a link sent by mail (32 random bytes, base64url) and the sha-256 hex that is all the database keeps. */
export function newLinkToken(): { token: string, hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashLinkToken(token) }
}

/** The sha-256 hex of a link's secret, the form it is stored and looked up in. */
export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/** When an invitation sent now stops working. */
export function invitationExpiry(from = new Date()): Date {
  return new Date(from.getTime() + INVITATION_DAYS * 24 * 60 * 60 * 1000)
}

/** Where an invitation stands at `now`: used, revoked, past its expiry, or open. */
export function invitationStatus(invitation: Pick<Invitation, 'acceptedAt' | 'revokedAt' | 'expiresAt'>, now = new Date()): InvitationLinkStatus {
  if (invitation.acceptedAt) return 'accepted'
  if (invitation.revokedAt) return 'revoked'
  if (invitation.expiresAt.getTime() <= now.getTime()) return 'expired'
  return 'open'
}

/** The sentence a link that no longer works shows, naming whom to ask. */
export function invitationClosedMessage(status: InvitationLinkStatus, inviterName: string | null, organisationName: string): string | null {
  const ask = inviterName ? `ask ${inviterName}` : `ask a manager of ${organisationName}`
  if (status === 'expired') return `This invitation has expired; ${ask} to send a new one.`
  if (status === 'revoked') return `This invitation was withdrawn; ${ask} if you think you should still join ${organisationName}.`
  if (status === 'accepted') return `This invitation has already been used to join ${organisationName}. Sign in with the e-mail address it was sent to.`
  return null
}

/** The outbox key of an invitation's n-th sending: each resend is a message of its own. */
export function invitationPeriodKey(invitation: Pick<Invitation, 'id' | 'sentCount'>): string {
  return `invitation-${invitation.id}-${invitation.sentCount}`
}

/** An open invitation as the Team page lists it. */
export function invitationView(invitation: Invitation & { invitedBy?: User | null }, delivery: OutboxStatus | null, now = new Date()): InvitationView {
  return {
    id: invitation.id,
    email: invitation.email,
    name: invitation.name,
    role: invitation.role,
    invitedBy: invitation.invitedBy ? { id: invitation.invitedBy.id, name: invitation.invitedBy.name } : null,
    sentAt: invitation.updatedAt.toISOString(),
    sentCount: invitation.sentCount,
    expiresAt: invitation.expiresAt.toISOString(),
    expired: invitation.expiresAt.getTime() <= now.getTime(),
    delivery,
  }
}

/** The outbox status of each invitation's current message, by invitation id. */
async function deliveries(organisationId: number, invitations: Invitation[]): Promise<Map<number, OutboxStatus>> {
  const { MailOutbox } = useModels()
  if (!invitations.length) return new Map()
  const byKey = new Map(invitations.map(i => [invitationPeriodKey(i), i.id]))
  const rows = await MailOutbox.findAll({
    attributes: ['periodKey', 'status'],
    where: { organisationId, kind: 'invitation', periodKey: [...byKey.keys()] },
  })
  return new Map(rows.map(r => [byKey.get(r.periodKey)!, r.status]))
}

/** The organisation's open invitations (expired ones included, until resent or revoked), newest first. */
export async function loadOpenInvitations(organisationId: number): Promise<InvitationView[]> {
  const { Invitation, User } = useModels()
  const rows = await Invitation.findAll({
    where: { organisationId, acceptedAt: null, revokedAt: null },
    include: [{ model: User, as: 'invitedBy', attributes: ['id', 'name'] }],
    order: [['updatedAt', 'DESC'], ['id', 'DESC']],
  })
  const status = await deliveries(organisationId, rows)
  return rows.map(r => invitationView(r as Invitation & { invitedBy?: User | null }, status.get(r.id) ?? null))
}

/** One open invitation of the caller's organisation as the list shows it, or a 404. */
export async function requireInvitationView(caller: Caller, id: number): Promise<InvitationView> {
  const views = await loadOpenInvitations(caller.organisationId)
  const view = views.find(v => v.id === id)
  if (!view) throw notFound('invitation')
  return view
}

/** The open invitation of the caller's organisation, locked for the transaction; 404 when there is none, 409 when it is closed. */
export async function lockInvitation(caller: Caller, id: number, transaction: Transaction): Promise<Invitation> {
  const { Invitation } = useModels()
  const invitation = await Invitation.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
  if (!invitation) throw notFound('invitation')
  if (invitation.acceptedAt) throw conflict(`${invitation.email} has already accepted this invitation.`)
  if (invitation.revokedAt) throw conflict(`This invitation to ${invitation.email} was revoked: invite them again instead.`)
  return invitation
}

/** A new link for an invitation: the secret for the message, its hash for the row, and when it stops working. */
export function newInvitationLink() {
  return { ...newLinkToken(), expiresAt: invitationExpiry() }
}

/**
 * Queues the message for the invitation's current sending, under the key
 * `invitation-<id>-<sentCount>`, so each resend is a message of its own and a retry is not.
 */
export async function queueInvitationMail(caller: Caller, invitation: Invitation, token: string) {
  const message = invitationMail({
    organisationName: caller.organisationName,
    inviterName: caller.name,
    inviteeName: invitation.name,
    role: invitation.role,
    link: appUrl(`/invite/${token}`),
    expiresAt: invitation.expiresAt,
    validDays: INVITATION_DAYS,
    timeZone: caller.timeZone,
    sentCount: invitation.sentCount,
  })
  await queueMail({
    organisationId: caller.organisationId,
    recipientUserId: null,
    to: invitation.email,
    toName: invitation.name,
    kind: 'invitation',
    periodKey: invitationPeriodKey(invitation),
    message,
  })
}

/**
 * Sends an open invitation again: a new secret (the old link's is overwritten, so it stops working
 * at once), seven fresh days, the sender as the inviter, and a new message.
 */
export async function resendInvitation(caller: Caller, invitation: Invitation, changes: { role?: Role, name?: string | null } = {}) {
  const link = newInvitationLink()
  await cancelWaitingInvitationMail(invitation)
  await invitation.update({
    tokenHash: link.hash,
    expiresAt: link.expiresAt,
    invitedById: caller.userId,
    sentCount: invitation.sentCount + 1,
    ...(changes.role ? { role: changes.role } : {}),
    ...(changes.name ? { name: changes.name } : {}),
  })
  await queueInvitationMail(caller, invitation, link.token)
}

/** Withdraws the invitation's messages still waiting to go: their link no longer works. */
export function cancelWaitingInvitationMail(invitation: Invitation) {
  return cancelWaitingMail({ organisationId: invitation.organisationId, kind: 'invitation', periodKeyPrefix: `invitation-${invitation.id}-` })
}

/** The user with this address (any case), or null. */
export async function findUserByEmail(email: string, transaction?: Transaction) {
  const { User, sequelize } = useModels()
  return User.findOne({ where: sequelize.where(sequelize.fn('lower', sequelize.col('email')), normaliseEmail(email)), transaction })
}

/** The invitation a link's secret opens, with its organisation and inviter, or null. */
export async function findInvitationByToken(token: string) {
  const { Invitation, Organisation, User } = useModels()
  const found = await Invitation.findOne({
    where: { tokenHash: hashLinkToken(token) },
    include: [{ model: Organisation, as: 'organisation' }, { model: User, as: 'invitedBy', attributes: ['id', 'name'] }],
  })
  return found as (Invitation & { organisation: Organisation, invitedBy: User | null }) | null
}

/** What the accept page shows for an invitation; the address and account only while the link works. */
export async function invitationLookupView(invitation: Invitation & { organisation: Organisation, invitedBy: User | null }): Promise<InvitationLookupView> {
  const status = invitationStatus(invitation)
  const inviterName = invitation.invitedBy?.name ?? null
  const open = status === 'open'
  return {
    status,
    organisationName: invitation.organisation.name,
    timeZone: invitation.organisation.timeZone,
    inviterName,
    role: invitation.role,
    expiresAt: invitation.expiresAt.toISOString(),
    email: open ? invitation.email : null,
    name: open ? invitation.name : null,
    hasAccount: open ? !!(await findUserByEmail(invitation.email)) : null,
    message: invitationClosedMessage(status, inviterName, invitation.organisation.name),
  }
}

/** The 404 for a link whose secret matches no invitation: never made, mistyped, or replaced by a resend. */
export function unknownInvitationLink() {
  return createError({
    statusCode: 404,
    statusMessage: 'Not Found',
    message: 'This invitation link does not work any more. It may have been replaced by a newer one: look for a later message, or ask the person who invited you to send it again.',
  })
}

/** The 410 for a link that was real but has expired, been revoked or been used. */
export function closedInvitationLink(message: string) {
  return createError({ statusCode: 410, statusMessage: 'Gone', message })
}

/** Whether the address already belongs to a member of the organisation. */
export async function isMemberEmail(organisationId: number, email: string, transaction?: Transaction): Promise<boolean> {
  const { Membership } = useModels()
  const user = await findUserByEmail(email, transaction)
  if (!user) return false
  return !!await Membership.findOne({ where: { organisationId, userId: user.id }, transaction })
}

/** The open invitation to an address in an organisation, locked for the transaction, or null. */
export async function findOpenInvitation(organisationId: number, email: string, transaction: Transaction) {
  const { Invitation, sequelize } = useModels()
  return Invitation.findOne({
    where: {
      organisationId,
      acceptedAt: null,
      revokedAt: null,
      [Op.and]: [sequelize.where(sequelize.fn('lower', sequelize.col('email')), normaliseEmail(email))],
    },
    transaction,
    lock: transaction.LOCK.UPDATE,
  })
}

/** A value checked against a schema after the body was read (a second, stricter check): a 400 naming each field. */
export function parseFields<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const result = schema.safeParse(value)
  if (result.success) return result.data
  const fields = Object.fromEntries(result.error.issues.map(issue => [issue.path.join('.') || '(body)', issue.message]))
  throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: describeIssues(result.error), data: { fields } })
}
