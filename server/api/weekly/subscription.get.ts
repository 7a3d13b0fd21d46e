import type { WeeklySubscriptionView } from '../../../shared/types/weekly'

/** Whether the caller gets the weekly status of their active organisation (everyone, for themselves). */
export default defineEventHandler(async (event): Promise<WeeklySubscriptionView> => {
  const caller = await requireCaller(event)
  const since = await weeklyUnsubscribedAt(caller.userId, caller.organisationId)
  return { subscribed: since === null, unsubscribedAt: since?.toISOString() ?? null }
})
