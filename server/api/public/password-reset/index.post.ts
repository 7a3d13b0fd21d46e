import { passwordResetRequestSchema, PASSWORD_RESET_ANSWER } from '../../../../shared/schemas/passwordReset'
import type { PasswordResetRequestResult } from '../../../../shared/types/invitations'

/**
 * Asks for a password-reset link. No session needed. The answer is the same sentence, at once,
 * whether or not an account has the address: looking the address up, the hourly limit and the
 * message all happen after the answer has gone, so neither the words nor the time taken tell an
 * outsider which addresses have accounts (OWASP Forgot Password Cheat Sheet).
 */
export default defineEventHandler(async (event): Promise<PasswordResetRequestResult> => {
  const { email } = await readBodyWith(event, passwordResetRequestSchema)
  const work = issuePasswordReset(email).catch((error) => {
    console.error(`Password reset request failed: ${(error as Error).message}`)
  })
  event.waitUntil(work)
  setResponseStatus(event, 202)
  return { message: PASSWORD_RESET_ANSWER }
})
