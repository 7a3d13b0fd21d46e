/** Makes the caller a new private feed URL, revoking any old one; the URL is shown this once. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const { CalendarFeed, sequelize } = useModels()
  const { token, hash } = newFeedToken()
  const feed = await sequelize.transaction(async (transaction) => {
    await CalendarFeed.update({ revokedAt: new Date() }, { where: { userId: caller.userId, organisationId: caller.organisationId, revokedAt: null }, transaction })
    return CalendarFeed.create({ userId: caller.userId, organisationId: caller.organisationId, tokenHash: hash }, { transaction })
  })
  setResponseStatus(event, 201)
  return { url: `${appOrigin(event)}/calendar/${token}.ics`, createdAt: feed.createdAt.toISOString() }
})
