/** Revokes the caller's feed: its URL answers 404 from now on. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const [revoked] = await useModels().CalendarFeed.update({ revokedAt: new Date() }, { where: { userId: caller.userId, organisationId: caller.organisationId, revokedAt: null } })
  return { revoked: revoked > 0 }
})
