import { z } from 'zod'
import { isISODate, WORK_KINDS } from '../coat'
import { DOG_SEXES, DOG_STATUSES, ENTRY_STATUSES } from '../types/kennel'
import { timeZoneSchema } from './organisation'

/** A calendar date 'YYYY-MM-DD' that exists (2027-02-31 does not). */
export const isoDateSchema = z.string().refine(isISODate, { message: 'Expected a date written YYYY-MM-DD that exists' })
  // PostgreSQL's date type cannot hold year 0, and nothing in a kennel's diary is that far off.
  .refine(v => v.slice(0, 4) >= '1900' && v.slice(0, 4) <= '2199', { message: 'Expected a date between 1900 and 2199' })

const optionalText = (max: number) => z.string().trim().max(max).transform(v => v || null).nullable().optional()
const email = z.email({ message: 'Not an e-mail address' }).max(254)

export const regionSchema = z.strictObject({
  key: z.string().trim().regex(/^[a-z][a-z0-9-]{0,39}$/, 'Lower-case letters, digits and hyphens, starting with a letter'),
  label: z.string().trim().min(1, 'Give the region a name').max(60),
  sproutDays: z.number().int().min(0).max(365),
  growDays: z.number().int().min(0).max(365),
  holdDays: z.number().int().min(0).max(365),
  weight: z.number().min(0).max(100),
  timerMinutes: z.number().int().min(1).max(240).optional(),
})

export const profileCreateSchema = z.strictObject({
  /** Copy this profile; the copy is then edited with PATCH. */
  copyFrom: z.number().int().positive(),
  label: z.string().trim().min(2).max(120),
})

export const profilePatchSchema = z.strictObject({
  label: z.string().trim().min(2).max(120).optional(),
  toleranceDays: z.number().int().min(1).max(120).optional(),
  onTrackScore: z.number().int().min(0).max(100).optional(),
  regions: z.array(regionSchema).min(1, 'A profile needs at least one region').max(40)
    .refine(rs => new Set(rs.map(r => r.key)).size === rs.length, { message: 'Each region key may appear once' })
    .optional(),
})

const dogFields = {
  callName: z.string().trim().min(1, 'Give the call name').max(60),
  registeredName: z.string().trim().min(1, 'Give the registered name').max(160),
  registrationNumber: optionalText(40),
  breed: z.string().trim().min(1, 'Give the breed').max(80),
  sex: z.enum(DOG_SEXES),
  dateOfBirth: isoDateSchema,
  colour: optionalText(60),
  ownerName: optionalText(120),
  ownerEmail: z.union([email, z.literal('')]).transform(v => v || null).nullable().optional(),
  ownerPhone: optionalText(40),
  handlerId: z.number().int().positive().nullable().optional(),
  coatProfileId: z.number().int().positive().optional(),
  notes: optionalText(4000),
  status: z.enum(DOG_STATUSES).optional(),
}
export const dogCreateSchema = z.strictObject(dogFields)
export type DogCreate = z.infer<typeof dogCreateSchema>
export const dogPatchSchema = z.strictObject(dogFields).partial()
  .refine(v => Object.keys(v).length > 0, { message: 'Nothing to change' })
export type DogPatch = z.infer<typeof dogPatchSchema>

export const dogListQuerySchema = z.object({
  search: z.string().trim().max(100).optional(),
  breed: z.string().trim().max(80).optional(),
  handler: z.coerce.number().int().positive().optional(),
  status: z.enum([...DOG_STATUSES, 'all']).optional(),
  show: z.coerce.number().int().positive().optional(),
})

export const workCreateSchema = z.strictObject({
  date: isoDateSchema,
  kind: z.enum(WORK_KINDS as unknown as [string, ...string[]]),
  regions: z.array(z.string().trim().min(1).max(40)).min(1, 'Pick at least one region').max(40),
  minutes: z.number().int().min(0).max(24 * 60).nullable().optional(),
  notes: optionalText(2000),
  /** Who did the work; the caller when absent. */
  workedById: z.number().int().positive().optional(),
})
export type WorkCreate = z.infer<typeof workCreateSchema>
export const workPatchSchema = workCreateSchema.partial().refine(v => Object.keys(v).length > 0, { message: 'Nothing to change' })

const hhmm = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Expected a time HH:mm')
const showFields = {
  name: z.string().trim().min(2, 'Give the show a name').max(160),
  club: optionalText(160),
  firstDay: isoDateSchema,
  lastDay: isoDateSchema,
  place: optionalText(200),
  judges: z.array(z.string().trim().min(1).max(120)).max(20).optional(),
  timeZone: timeZoneSchema.optional(),
  /** When entries close, on the show's own wall clock. */
  entriesCloseDate: isoDateSchema.nullable().optional(),
  entriesCloseTime: hhmm.nullable().optional(),
  notes: optionalText(4000),
}
export const showCreateSchema = z.strictObject(showFields)
  .refine(v => v.lastDay >= v.firstDay, { message: 'The last day cannot be before the first day', path: ['lastDay'] })
  .refine(v => !v.entriesCloseDate || v.entriesCloseDate <= v.firstDay, { message: 'Entries must close on or before the first day', path: ['entriesCloseDate'] })
export type ShowCreate = z.infer<typeof showCreateSchema>
export const showPatchSchema = z.strictObject(showFields).partial()
  .refine(v => Object.keys(v).length > 0, { message: 'Nothing to change' })

export const showListQuerySchema = z.object({
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  past: z.enum(['true', 'false']).optional(),
})

export const entryCreateSchema = z.strictObject({
  dogId: z.number().int().positive(),
  showId: z.number().int().positive(),
  classCode: z.string().trim().regex(/^(akc|kc|fci):[a-z0-9-]+$/, 'A class code such as kc:junior'),
  armband: optionalText(20),
  status: z.enum(ENTRY_STATUSES).optional(),
  handlerId: z.number().int().positive().nullable().optional(),
  notes: optionalText(2000),
})
export type EntryCreate = z.infer<typeof entryCreateSchema>
export const entryPatchSchema = entryCreateSchema.omit({ dogId: true, showId: true }).partial()
  .refine(v => Object.keys(v).length > 0, { message: 'Nothing to change' })

export const entryListQuerySchema = z.object({
  show: z.coerce.number().int().positive().optional(),
  dog: z.coerce.number().int().positive().optional(),
  status: z.enum(ENTRY_STATUSES).optional(),
})

export const readinessQuerySchema = z.object({
  show: z.coerce.number().int().positive().optional(),
  /** A date to assess on instead of a show (what-if). */
  date: isoDateSchema.optional(),
})

export const gridQuerySchema = z.object({
  show: z.union([z.literal('next'), z.coerce.number().int().positive()]).optional(),
})

export const workListQuerySchema = z.object({
  /** Only work on this region (a coat grid cell opens its region's history). */
  region: z.string().trim().min(1).max(40).optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  /** 'true' lists deleted work too (managers only). */
  deleted: z.enum(['true', 'false']).optional(),
})

/**
 * The show form's check: a whole show, with the entries-close date and time given together, as
 * the server requires (it refuses one without the other); the edit form sends the whole show too.
 */
export const showFormSchema = showCreateSchema
  .refine(v => !v.entriesCloseTime || !!v.entriesCloseDate, { message: 'Give the date entries close as well as the time', path: ['entriesCloseDate'] })
  .refine(v => !v.entriesCloseDate || !!v.entriesCloseTime, { message: 'Give the time entries close as well as the date', path: ['entriesCloseTime'] })
