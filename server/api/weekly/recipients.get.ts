import { weeklyRecipientsQuerySchema } from '../../../shared/schemas/weekly'
import type { WeeklyRecipientsView } from '../../../shared/types/weekly'

/** Every member with whether they get an ISO week's status (this week by default) and where theirs stands (managers). */
export default defineEventHandler(async (event): Promise<WeeklyRecipientsView> => {
  const caller = await requireCaller(event, ['manager'])
  const { week } = await queryWith(event, weeklyRecipientsQuerySchema)
  const organisation = await callerWeeklyOrganisation(caller)
  const chosen = weeklyWeekOf(organisation, week)
  return {
    week: chosen.week,
    weekStart: chosen.start,
    weekEnd: chosen.end,
    sendAt: chosen.sendAt.toISOString(),
    due: chosen.due,
    enabled: organisation.weeklyEnabled,
    recipients: await loadWeeklyRecipients(organisation, chosen.week),
  }
})
