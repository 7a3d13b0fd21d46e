/** Lower-cased and trimmed, the form every e-mail address is stored and counted in. */
export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase()
}

/** The one sentence for a wrong e-mail and a wrong password alike (OWASP Authentication Cheat Sheet). */
export const SIGN_IN_FAILED = 'That e-mail and password do not match an account.'

export const SIGN_IN_MAX_FAILURES = 10
export const SIGN_IN_WINDOW_MINUTES = 15
