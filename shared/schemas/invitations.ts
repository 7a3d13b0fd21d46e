import { z } from 'zod'
import { ROLES } from '../types/organisation'
import { emailInputSchema, newPasswordSchema } from './passwordReset'

/** How long an invitation link works, from when it was last sent. */
export const INVITATION_DAYS = 7

const personName = z.string().trim().min(2, 'Give a name of at least 2 characters').max(120, 'Use at most 120 characters')

export const invitationCreateSchema = z.strictObject({
  email: emailInputSchema,
  role: z.enum(ROLES, { message: 'Choose manager, handler or assistant' }),
  // A blank name is no name: the person gives their own when they join.
  name: z.union([personName, z.literal('').transform(() => null)]).nullable().optional(),
})
export type InvitationCreate = z.infer<typeof invitationCreateSchema>

/** What the accept page sends: a new person's name and password, or an existing account's password. */
export const invitationAcceptSchema = z.strictObject({
  name: personName.optional(),
  password: z.string().min(1, 'Enter a password').max(200, 'Use at most 200 characters'),
})
export type InvitationAccept = z.infer<typeof invitationAcceptSchema>

/** The stricter check for a person who has no account yet: a name, and a password that meets the rule. */
export const invitationJoinNewSchema = z.strictObject({
  name: personName,
  password: newPasswordSchema,
})

/** The check for a person who already has an account: their current password. */
export const invitationJoinExistingSchema = z.strictObject({
  password: z.string().min(1, 'Enter your current password').max(200, 'Use at most 200 characters'),
})
