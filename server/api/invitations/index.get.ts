/** The organisation's open invitations (expired ones too, until resent or revoked). Managers, and handlers read-only. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  return loadOpenInvitations(caller.organisationId)
})
