import { normaliseEmail } from '../../../shared/auth'
import { invitationCreateSchema } from '../../../shared/schemas/invitations'
import type { InvitationCreateResult } from '../../../shared/types/invitations'

/**
 * Invites a person by e-mail with a role, and queues the message. An address that already has an
 * open invitation here gets that invitation sent again (new link, new role and name, seven fresh
 * days) rather than a second one; an address that is already a member is a 409.
 */
export default defineEventHandler(async (event): Promise<InvitationCreateResult> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readBodyWith(event, invitationCreateSchema)
  const email = normaliseEmail(body.email)
  const { Invitation, sequelize } = useModels()
  const { id, resent } = await sequelize.transaction(async (transaction) => {
    // One at a time per address, so two managers inviting the same person at once make one invitation.
    await sequelize.query('SELECT pg_advisory_xact_lock(hashtext($1))', { bind: [`invitation:${caller.organisationId}:${email}`], transaction })
    if (await isMemberEmail(caller.organisationId, email, transaction)) {
      throw conflict(`${email} is already a member of ${caller.organisationName}: change their role on the Team page instead.`)
    }
    const open = await findOpenInvitation(caller.organisationId, email, transaction)
    if (open) {
      await resendInvitation(caller, open, { role: body.role, name: body.name ?? undefined })
      return { id: open.id, resent: true }
    }
    const link = newInvitationLink()
    const invitation = await Invitation.create({
      organisationId: caller.organisationId,
      email,
      name: body.name ?? null,
      role: body.role,
      tokenHash: link.hash,
      invitedById: caller.userId,
      expiresAt: link.expiresAt,
    }, { transaction })
    await queueInvitationMail(caller, invitation, link.token)
    return { id: invitation.id, resent: false }
  })
  setResponseStatus(event, resent ? 200 : 201)
  return { invitation: await requireInvitationView(caller, id), resent }
})
