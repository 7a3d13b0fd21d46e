import { unsubscribeTokenParamSchema } from '../../../../shared/schemas/weekly'

/** Undoes an unsubscribe from the same link: the person gets the weekly status again. No session needed. */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, unsubscribeTokenParamSchema)
  const { userId, organisationId } = await requireUnsubscribeLink(token)
  await setWeeklySubscribed(userId, organisationId, true)
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return (await requireUnsubscribeLink(token)).view
})
