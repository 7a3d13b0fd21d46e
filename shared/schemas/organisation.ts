import { z } from 'zod'
import { ORGANISATION_KINDS, ROLES, RULE_SET_NAMES } from '../types/organisation'

/** True when the runtime knows the IANA time zone name. */
export function isTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: name })
    return true
  }
  catch {
    return false
  }
}

export const timeZoneSchema = z.string().trim().min(1).max(64)
  .refine(isTimeZone, { message: 'Not a time zone this server knows (use an IANA name such as Europe/London)' })

export const organisationPatchSchema = z.strictObject({
  name: z.string().trim().min(2, 'Give a name of at least 2 characters').max(120).optional(),
  kind: z.enum(ORGANISATION_KINDS).optional(),
  timeZone: timeZoneSchema.optional(),
  ruleSet: z.enum(RULE_SET_NAMES).optional(),
}).refine(v => Object.keys(v).length > 0, { message: 'Nothing to change: send at least one of name, kind, timeZone, ruleSet' })
export type OrganisationPatch = z.infer<typeof organisationPatchSchema>

export const memberPatchSchema = z.strictObject({
  role: z.enum(ROLES),
})
export type MemberPatch = z.infer<typeof memberPatchSchema>

export const switchOrganisationSchema = z.strictObject({
  organisationId: z.number().int().positive(),
})

export const idParamSchema = z.object({
  id: z.coerce.number().int().positive(),
})
