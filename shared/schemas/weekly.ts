import { z } from 'zod'
import { isIsoWeekKey } from '../weekly/schedule'

const userId = z.coerce.number({ message: 'Expected a member\'s user id' }).int('Expected a whole number').positive('Expected a member\'s user id')

export const weeklySettingsPatchSchema = z.strictObject({
  day: z.number({ message: 'Expected an ISO weekday, 1 (Monday) to 7 (Sunday)' }).int('Expected a whole number').min(1, 'Expected an ISO weekday, 1 (Monday) to 7 (Sunday)').max(7, 'Expected an ISO weekday, 1 (Monday) to 7 (Sunday)').optional(),
  hour: z.number({ message: 'Expected an hour from 0 to 23' }).int('Expected a whole hour').min(0, 'Expected an hour from 0 to 23').max(23, 'Expected an hour from 0 to 23').optional(),
  enabled: z.boolean({ message: 'Expected true or false' }).optional(),
  toAssistants: z.boolean({ message: 'Expected true or false' }).optional(),
}).refine(v => Object.keys(v).length > 0, { message: 'Nothing to change: send at least one of day, hour, enabled, toAssistants' })
export type WeeklySettingsPatch = z.infer<typeof weeklySettingsPatchSchema>

export const weekKeySchema = z.string().refine(isIsoWeekKey, { message: 'Expected an ISO 8601 week such as 2026-W49 that exists' })

export const weeklyRecipientsQuerySchema = z.strictObject({
  week: weekKeySchema.optional(),
})

export const weeklyPreviewQuerySchema = z.strictObject({
  userId,
})

export const weeklySendNowSchema = z.strictObject({
  userId: z.number({ message: 'Expected a member\'s user id' }).int('Expected a whole number').positive('Expected a member\'s user id').optional(),
})
export type WeeklySendNow = z.infer<typeof weeklySendNowSchema>

export const weeklySubscriptionSchema = z.strictObject({
  subscribed: z.boolean({ message: 'Expected true or false' }),
})

// userId-organisationId-signature: the signature is 43 base64url characters (an HMAC-SHA256).
export const unsubscribeTokenParamSchema = z.object({
  token: z.string().regex(/^\d{1,10}-\d{1,10}-[\w-]{43}$/, 'Not an unsubscribe link'),
})

/** What the weekly tick's pg-boss job may carry: nothing from the cron; an instant and one organisation from a test or an operator. */
export const weeklyTickJobSchema = z.strictObject({
  at: z.iso.datetime({ offset: true }).optional(),
  organisationId: z.number().int().positive().optional(),
})
export type WeeklyTickJob = z.infer<typeof weeklyTickJobSchema>
