/** Revokes an open invitation: its link stops working at once, and a message of it still waiting is withdrawn. Managers only. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'invitation')
  const { sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const invitation = await lockInvitation(caller, id, transaction)
    await invitation.update({ revokedAt: new Date() }, { transaction })
    await cancelWaitingInvitationMail(invitation)
  })
  setResponseStatus(event, 204)
  return null
})
