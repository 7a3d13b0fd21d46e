import { z } from 'zod'
import { WORK_KINDS } from '../coat'
import { isoDateSchema } from './kennel'

const id = z.number().int().positive()
const hhmm = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Expected a time HH:mm')
const kind = z.enum(WORK_KINDS as unknown as [string, ...string[]])
const regions = z.array(z.string().trim().min(1).max(40)).min(1, 'Pick at least one region').max(40)
const notes = z.string().trim().max(2000).transform(v => v || null).nullable().optional()
const windowOrder = (v: { windowStart?: string | null, windowEnd?: string | null }) => !v.windowStart || !v.windowEnd || v.windowStart < v.windowEnd
const windowMessage = { message: 'The window must end after it starts', path: ['windowEnd'] }

const taskFields = {
  dogId: id,
  regions,
  kind,
  dueDate: isoDateSchema,
  windowStart: hhmm.nullable().optional(),
  windowEnd: hhmm.nullable().optional(),
  /** Who does the task; nobody yet when absent. */
  assigneeId: id.nullable().optional(),
  notes,
  /** The plan step the task comes from (planStepKey in shared/tasks.ts). */
  planStepKey: z.string().trim().min(1).max(200).nullable().optional(),
}
export const taskCreateSchema = z.strictObject(taskFields).refine(windowOrder, windowMessage)
export type TaskCreate = z.infer<typeof taskCreateSchema>

export const taskPatchSchema = z.strictObject({
  dueDate: isoDateSchema.optional(),
  assigneeId: id.nullable().optional(),
  windowStart: hhmm.nullable().optional(),
  windowEnd: hhmm.nullable().optional(),
  notes,
  regions: regions.optional(),
  kind: kind.optional(),
  /** Only between open and in progress; finishing, skipping and reopening have their own routes. */
  status: z.enum(['open', 'in-progress']).optional(),
  /** Minutes the area timer has counted so far. */
  minutes: z.number().int().min(0).max(24 * 60).nullable().optional(),
}).refine(v => Object.keys(v).length > 0, { message: 'Nothing to change' }).refine(windowOrder, windowMessage)
export type TaskPatch = z.infer<typeof taskPatchSchema>

/** Turn plan steps into tasks: the steps named by key, or every step dated in a range (default: the coming weeks). */
export const fromPlanSchema = z.strictObject({
  dogId: id,
  steps: z.array(z.strictObject({ key: z.string().trim().min(1).max(200) })).min(1, 'Pick at least one step').max(200).optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  /** Who the new tasks go to; nobody yet when absent. */
  assigneeId: id.nullable().optional(),
}).refine(v => !v.from || !v.to || v.from <= v.to, { message: 'The range cannot end before it starts', path: ['to'] })
export type FromPlan = z.infer<typeof fromPlanSchema>

export const finishSchema = z.strictObject({
  /** The day the work was done: today when absent, editable, never after today. */
  date: isoDateSchema.optional(),
  minutes: z.number().int().min(0).max(24 * 60).nullable().optional(),
  notes,
  /** Who did the work; the assignee (or the caller) when absent. */
  workedById: id.optional(),
})
export type Finish = z.infer<typeof finishSchema>

export const skipSchema = z.strictObject({
  reason: z.string().trim().min(3, 'Say why the task is skipped').max(500),
  /** Required when the task was done: true soft-deletes its coat work, false keeps it. */
  removeWork: z.boolean().optional(),
})
export type Skip = z.infer<typeof skipSchema>

export const reopenSchema = z.strictObject({
  /** Required when the task is done: the user must choose to keep or remove its coat work. */
  keepWork: z.boolean().optional(),
})
export type Reopen = z.infer<typeof reopenSchema>

export const taskListQuerySchema = z.object({
  /** 'true': only tasks assigned to the caller. */
  mine: z.enum(['true', 'false']).optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  status: z.enum(['open', 'in-progress', 'done', 'skipped', 'active']).optional(),
  dog: z.coerce.number().int().positive().optional(),
  assignee: z.coerce.number().int().positive().optional(),
})

export const weekQuerySchema = z.object({
  /** Any day of the week; the board starts on its Monday. Today's week when absent. */
  start: isoDateSchema.optional(),
})

export const dogQuerySchema = z.object({ dog: z.coerce.number().int().positive() })

export const planStepsQuerySchema = z.object({
  dog: z.coerce.number().int().positive(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
})
