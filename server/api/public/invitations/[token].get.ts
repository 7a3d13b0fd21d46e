import { linkTokenParamSchema } from '../../../../shared/schemas/passwordReset'

/** What the accept page needs to know about an invitation link: open or not, for whom, from whom. No session needed. */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, linkTokenParamSchema)
  const invitation = await findInvitationByToken(token)
  if (!invitation) throw unknownInvitationLink()
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return invitationLookupView(invitation)
})
