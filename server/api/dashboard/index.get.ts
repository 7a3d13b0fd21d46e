import type { DashboardView } from '../../../shared/types/kennel'

/** The dashboard of the dogs the caller may see, computed now from the stored work. */
export default defineEventHandler(async (event): Promise<DashboardView> => {
  const caller = await requireCaller(event)
  return loadDashboard(caller)
})
