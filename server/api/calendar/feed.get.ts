/** Whether the caller has a live calendar feed in this organisation, when it was made and last read; never the token. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const feed = await useModels().CalendarFeed.findOne({ where: { userId: caller.userId, organisationId: caller.organisationId, revokedAt: null } })
  return {
    exists: Boolean(feed),
    createdAt: feed ? feed.createdAt.toISOString() : null,
    lastUsedAt: feed?.lastUsedAt ? feed.lastUsedAt.toISOString() : null,
  }
})
