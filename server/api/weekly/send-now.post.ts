import { weeklySendNowSchema } from '../../../shared/schemas/weekly'
import type { WeeklySendResult } from '../../../shared/types/weekly'

/**
 * Queues this week's status now, for every member who gets it or for one (managers), whatever the
 * schedule says. A member whose message for the week is already in the outbox is reported as
 * already sent: the outbox key forbids a second copy.
 */
export default defineEventHandler(async (event): Promise<WeeklySendResult> => {
  const caller = await requireCaller(event, ['manager'])
  const { userId } = await readBodyWith(event, weeklySendNowSchema)
  if (userId !== undefined) await requireMember(caller, userId, 'userId')
  const organisation = await callerWeeklyOrganisation(caller)
  const { week } = weeklyWeekOf(organisation)
  const results = await queueWeeklyStatus(organisation, week, { userId })
  const queued = results.filter(r => r.outcome === 'queued').length
  if (queued) setResponseStatus(event, 201)
  return { week, results, queued }
})
