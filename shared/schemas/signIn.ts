import { z } from 'zod'

/** The fields the credentials sign-in reads; the rest of next-auth's form passes through. */
export const credentialsSchema = z.looseObject({
  email: z.string().trim().min(1, 'Enter your e-mail address').max(254),
  password: z.string().min(1, 'Enter your password').max(200),
})
