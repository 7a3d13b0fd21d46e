import { weeklySubscriptionSchema } from '../../../shared/schemas/weekly'
import type { WeeklySubscriptionView } from '../../../shared/types/weekly'

/** Stops or starts again the caller's own weekly status from their active organisation (everyone, for themselves). */
export default defineEventHandler(async (event): Promise<WeeklySubscriptionView> => {
  const caller = await requireCaller(event)
  const { subscribed } = await readBodyWith(event, weeklySubscriptionSchema)
  await setWeeklySubscribed(caller.userId, caller.organisationId, subscribed)
  return weeklySubscriptionView(caller)
})
