import { unsubscribeTokenParamSchema } from '../../../../shared/schemas/weekly'

/**
 * Unsubscribes the link's person from the organisation's weekly status: the one-button page, and
 * the one-click POST of RFC 8058 that a mail client sends with the body `List-Unsubscribe=One-Click`.
 * No session, cookie or CSRF token: the signed link is the proof (RFC 8058 §3.2), and the body is
 * not read, since clients send it as either form encoding. Repeating it changes nothing.
 */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, unsubscribeTokenParamSchema)
  const { userId, organisationId } = await requireUnsubscribeLink(token)
  await setWeeklySubscribed(userId, organisationId, false)
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return (await requireUnsubscribeLink(token)).view
})
