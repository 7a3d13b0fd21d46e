import { linkTokenParamSchema } from '../../../../shared/schemas/passwordReset'

/** What the reset page needs to know about a link: whether it still works, and for which address. No session needed. */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, linkTokenParamSchema)
  const reset = await findResetByToken(token)
  if (!reset) throw unknownResetLink()
  setResponseHeader(event, 'Cache-Control', 'no-store')
  return passwordResetLookupView(reset)
})
