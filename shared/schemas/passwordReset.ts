import { z } from 'zod'

/**
 * The least a new password may be: 8 characters, the floor of NIST SP 800-63B §3.1.1.2 and OWASP
 * ASVS 5.0 V6.2.1 for a password the person chooses. Sign-in itself only asks for one character,
 * so the accounts made before this rule still sign in.
 */
export const PASSWORD_MIN_LENGTH = 8

/** bcrypt reads no further than 72 bytes, so a longer password would be cut short without a word. */
export const PASSWORD_MAX_BYTES = 72

/** How long a password-reset link works. */
export const RESET_LINK_MINUTES = 60

/** How many reset messages one address may be sent within an hour; more requests are dropped silently. */
export const RESET_MAILS_PER_HOUR = 3

/** UTF-8 length of a string, as bcrypt counts it. */
function utf8Length(text: string): number {
  return new TextEncoder().encode(text).length
}

export const newPasswordSchema = z.string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters`)
  .refine(v => utf8Length(v) <= PASSWORD_MAX_BYTES, { message: `Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} letters without accents)` })
  .refine(v => v.trim().length > 0, { message: 'A password cannot be only spaces' })

/** The secret of a link sent by mail: 32 random bytes in base64url, 43 characters. */
export const linkTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'This link is not a Bloomline link: check it was copied whole')

export const linkTokenParamSchema = z.object({ token: linkTokenSchema })

/** An e-mail address as a person types it: spaces around it are dropped before it is checked. */
export const emailInputSchema = z.string().trim().max(254, 'Use at most 254 characters').pipe(z.email({ message: 'Enter an e-mail address, such as name@kennel.example' }))

export const passwordResetRequestSchema = z.strictObject({
  email: emailInputSchema,
})
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>

export const passwordResetConfirmSchema = z.strictObject({
  password: newPasswordSchema,
})
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>

/** The one answer to a reset request, whether or not an account has the address (OWASP Forgot Password Cheat Sheet). */
export const PASSWORD_RESET_ANSWER = 'If a Bloomline account uses that address, a link to choose a new password is on its way to it. The link works for one hour. No message? Check the address and your spam folder, then ask again.'
