/** Sends an open invitation again: a new link (the old one stops working), seven fresh days, a new message. Managers only. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'invitation')
  const { sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const invitation = await lockInvitation(caller, id, transaction)
    await resendInvitation(caller, invitation)
  })
  return requireInvitationView(caller, id)
})
