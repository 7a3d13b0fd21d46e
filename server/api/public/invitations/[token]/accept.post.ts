import bcrypt from 'bcryptjs'
import { UniqueConstraintError } from 'sequelize'
import { invitationAcceptSchema, invitationJoinExistingSchema, invitationJoinNewSchema } from '../../../../../shared/schemas/invitations'
import { linkTokenParamSchema } from '../../../../../shared/schemas/passwordReset'
import type { InvitationAcceptResult } from '../../../../../shared/types/invitations'

/**
 * Joins the organisation through an invitation link, once. A new person gives a name and a
 * password and gets an account; a person who already has an account with that address (any case)
 * proves it with their current password, which is counted against the sign-in lock-out like any
 * sign-in, and keeps it. Either way the invitation is used up and they start in this organisation.
 */
export default defineEventHandler(async (event): Promise<InvitationAcceptResult> => {
  const { token } = await paramsWith(event, linkTokenParamSchema)
  const body = await readBodyWith(event, invitationAcceptSchema)
  const found = await findInvitationByToken(token)
  if (!found) throw unknownInvitationLink()
  const closed = invitationClosedMessage(invitationStatus(found), found.invitedBy?.name ?? null, found.organisation.name)
  if (closed) throw closedInvitationLink(closed)

  const existing = await findUserByEmail(found.email)
  let passwordHash: string | null = null
  if (existing) {
    const { password } = parseFields(invitationJoinExistingSchema, { password: body.password })
    // Outside the transaction below, so a wrong password stays counted even though nothing is written.
    const lockedUntil = await signInLockedUntil(existing.email)
    if (lockedUntil) {
      throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message: 'Too many failed sign-ins for this e-mail. Wait a few minutes and try again, or reset your password.' })
    }
    if (!await checkCredentials(existing.email, password)) {
      throw invalidField('password', `That is not the current password of ${existing.email}. Use “Forgot your password?” on the sign-in page if you have lost it.`)
    }
  }
  else {
    const { name, password } = parseFields(invitationJoinNewSchema, { name: body.name ?? found.name ?? '', password: body.password })
    body.name = name
    passwordHash = await bcrypt.hash(password, 10)
  }

  const { Invitation, Membership, User, sequelize } = useModels()
  return sequelize.transaction(async (transaction) => {
    // Read again under a lock: two tabs accepting at once join once, and the second is told it was used.
    const invitation = await Invitation.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE })
    const status = invitation ? invitationStatus(invitation) : 'revoked'
    if (!invitation || invitation.tokenHash !== found.tokenHash) throw unknownInvitationLink()
    if (status !== 'open') throw closedInvitationLink(invitationClosedMessage(status, found.invitedBy?.name ?? null, found.organisation.name)!)
    let user = existing
    if (!user) {
      try {
        user = await User.create({ email: invitation.email, name: body.name!, passwordHash: passwordHash!, lastOrganisationId: invitation.organisationId }, { transaction })
      }
      catch (error) {
        if (error instanceof UniqueConstraintError) throw conflict('An account with this address was made a moment ago. Open the link again to join with its password.')
        throw error
      }
    }
    else {
      await user.update({ lastOrganisationId: invitation.organisationId }, { transaction })
    }
    // Already a member (invited twice, joined through one): the role they have stays.
    const membership = await Membership.findOne({ where: { userId: user.id, organisationId: invitation.organisationId }, transaction })
      ?? await Membership.create({ userId: user.id, organisationId: invitation.organisationId, role: invitation.role }, { transaction })
    await invitation.update({ acceptedAt: new Date(), acceptedUserId: user.id }, { transaction })
    return { email: user.email, organisationName: found.organisation.name, role: membership.role, newAccount: !existing }
  })
})

