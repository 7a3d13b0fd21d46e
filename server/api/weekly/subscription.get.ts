import type { WeeklySubscriptionView } from '../../../shared/types/weekly'

/** Whether the caller gets the weekly status of their active organisation (everyone, for themselves). */
export default defineEventHandler(async (event): Promise<WeeklySubscriptionView> => {
  return weeklySubscriptionView(await requireCaller(event))
})
