import { unsubscribeTokenParamSchema } from '../../../../shared/schemas/weekly'

/** Whose weekly status from which organisation an unsubscribe link stops, and whether it already has. No session needed. */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, unsubscribeTokenParamSchema)
  const { view } = await requireUnsubscribeLink(token)
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return view
})
