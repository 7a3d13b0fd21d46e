import { linkTokenParamSchema, passwordResetConfirmSchema } from '../../../../shared/schemas/passwordReset'

/** Sets a new password through a reset link, once; every session of the person ends. No session needed. */
export default defineEventHandler(async (event) => {
  const { token } = await paramsWith(event, linkTokenParamSchema)
  const { password } = await readBodyWith(event, passwordResetConfirmSchema)
  return confirmPasswordReset(token, password)
})
