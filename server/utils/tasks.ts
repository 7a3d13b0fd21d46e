import { QueryTypes, type Transaction } from 'sequelize'
import { addDays, DEFAULT_PROFILE, planWorkBack, type ISODate, type WorkKind } from '../../shared/coat'
import { PLAN_TASK_WEEKS, planStepKey } from '../../shared/tasks'
import { DEFAULT_TIMER_MINUTES, type PersonRef, type StoredRegion, type TaskStatus } from '../../shared/types/kennel'
import type { Role } from '../../shared/types/organisation'
import type { PlanStepOffer, TaskView } from '../../shared/types/tasks'
import type { Caller } from './auth'
import { callerToday, checkWorkFields, conflict, invalidField, kennelSequelize, loadDogPulls, MAX_ROW_ID, requireMember } from './kennel'
import { loadDogRecords, loadLiveShows, loadProfiles, type DogRecord, type SqlWhere, type StoredProfile } from './kennelData'
import { ASSISTANT_RECENT_TASK_DAYS, dogScopeCondition } from './scope'
import { auditSnapshot, recordAudit } from './audit'

/** A task row as the raw queries read it, with its dog and the names of the people on it. */
export interface TaskRecord {
  id: number
  dogId: number
  dogCallName: string
  dogBreed: string
  dogColour: string | null
  coatProfileId: number
  kind: WorkKind
  regions: string[]
  dueDate: ISODate
  windowStart: string | null
  windowEnd: string | null
  assigneeId: number | null
  assigneeName: string | null
  createdById: number | null
  createdByName: string | null
  status: TaskStatus
  skipReason: string | null
  minutes: number | null
  notes: string | null
  planStepKey: string | null
  /** The linked coat work, only while it is not deleted. */
  coatWorkId: number | null
  doneAt: Date | null
  createdAt: Date
  updatedAt: Date
  /** Whether the dog is in the caller's reach (a handler's own dog). */
  dogInScope: boolean
}

const ACTIVE_SQL = `('open', 'in-progress')`

const forbidden = (message: string) => createError({ statusCode: 403, statusMessage: 'Forbidden', message })

/**
 * The SQL condition (tasks `t` joined to their dog `d`) that keeps a caller's tasks: a manager every
 * task of the organisation; a handler the tasks on the dogs they reach, and those they created or
 * were given; an assistant the tasks given to them that still keep their dog in reach (DESIGN.md §2).
 */
export function taskScopeCondition(caller: Caller, today: ISODate): SqlWhere {
  const replacements = { scopeOrg: caller.organisationId, scopeMe: caller.userId, scopeSince: addDays(today, -ASSISTANT_RECENT_TASK_DAYS) }
  const org = 't.organisation_id = :scopeOrg'
  if (caller.role === 'manager') return { sql: org, replacements }
  if (caller.role === 'handler') {
    return { sql: `${org} AND (${dogScopeCondition(caller, today, 'd')} OR t.created_by_id = :scopeMe OR t.assignee_id = :scopeMe)`, replacements }
  }
  return { sql: `${org} AND t.assignee_id = :scopeMe AND (t.status IN ${ACTIVE_SQL} OR t.due_date >= :scopeSince)`, replacements }
}

/** The caller's tasks matching a condition on `t`/`d`, by due date, window and dog; inside a transaction, locked for a change. */
export async function loadTaskRecords(caller: Caller, where: SqlWhere, options: { transaction?: Transaction, today?: ISODate } = {}): Promise<TaskRecord[]> {
  const today = options.today ?? callerToday(caller)
  const scope = taskScopeCondition(caller, today)
  const inScope = caller.role === 'manager' ? 'true' : dogScopeCondition(caller, today, 'd')
  return kennelSequelize().query<TaskRecord>(
    `SELECT t.id, t.dog_id AS "dogId", d.call_name AS "dogCallName", d.breed AS "dogBreed", d.colour AS "dogColour",
       d.coat_profile_id AS "coatProfileId", t.kind, t.regions, t.due_date AS "dueDate",
       to_char(t.window_start, 'HH24:MI') AS "windowStart", to_char(t.window_end, 'HH24:MI') AS "windowEnd",
       t.assignee_id AS "assigneeId", au.name AS "assigneeName", t.created_by_id AS "createdById", cu.name AS "createdByName",
       t.status, t.skip_reason AS "skipReason", t.minutes, t.notes, t.plan_step_key AS "planStepKey",
       w.id AS "coatWorkId", t.done_at AS "doneAt", t.created_at AS "createdAt", t.updated_at AS "updatedAt",
       (${inScope}) AS "dogInScope"
     FROM tasks t JOIN dogs d ON d.id = t.dog_id
     LEFT JOIN users au ON au.id = t.assignee_id LEFT JOIN users cu ON cu.id = t.created_by_id
     LEFT JOIN coat_work w ON w.id = t.coat_work_id AND w.deleted_at IS NULL
     WHERE ${scope.sql} AND (${where.sql})
     ORDER BY t.due_date, t.window_start NULLS LAST, lower(d.call_name), t.id
     ${options.transaction ? 'FOR UPDATE OF t' : ''}`,
    { type: QueryTypes.SELECT, raw: true, replacements: { ...where.replacements, ...scope.replacements }, transaction: options.transaction },
  )
}

/** What the caller is to a task: its assignee (`own`), and whether they run it (a manager, or a handler for their dog or a task they created). */
export function taskAccess(caller: Caller, task: Pick<TaskRecord, 'assigneeId' | 'createdById' | 'dogInScope'>) {
  const own = task.assigneeId === caller.userId
  const manage = caller.role === 'manager' || (caller.role === 'handler' && (task.dogInScope || task.createdById === caller.userId))
  return { own, manage }
}

const person = (id: number | null, name: string | null): PersonRef | null => (id === null ? null : { id, name: name ?? '' })

/** The area-timer limits of some regions in a profile (its timerMinutes, or the default). */
export function regionLimits(profile: StoredProfile | undefined, regions: readonly string[]) {
  const stored: StoredRegion[] = profile?.regions ?? DEFAULT_PROFILE.regions
  const byKey = new Map(stored.map(r => [r.key, r]))
  return regions.map((key) => {
    const region = byKey.get(key)
    return { key, label: region?.label ?? key, minutes: region?.timerMinutes ?? DEFAULT_TIMER_MINUTES }
  })
}

/** A task row as the API shows it, with what the caller may do with it. */
export function taskView(caller: Caller, today: ISODate, t: TaskRecord, profile: StoredProfile | undefined): TaskView {
  const { own, manage } = taskAccess(caller, t)
  const active = t.status === 'open' || t.status === 'in-progress'
  const limits = regionLimits(profile, t.regions)
  return {
    id: t.id,
    dog: { id: t.dogId, callName: t.dogCallName, breed: t.dogBreed, markColour: t.dogColour },
    regions: t.regions,
    regionLabels: limits.map(l => l.label),
    regionLimits: limits,
    kind: t.kind,
    dueDate: t.dueDate,
    windowStart: t.windowStart,
    windowEnd: t.windowEnd,
    assignee: person(t.assigneeId, t.assigneeName),
    createdBy: person(t.createdById, t.createdByName),
    status: t.status,
    skipReason: t.skipReason,
    minutes: t.minutes,
    notes: t.notes,
    planStepKey: t.planStepKey,
    coatWorkId: t.coatWorkId,
    doneAt: t.doneAt ? new Date(t.doneAt).toISOString() : null,
    overdue: active && t.dueDate < today,
    can: {
      edit: manage && active,
      assign: manage && active,
      start: (own || manage) && t.status === 'open',
      finish: (own || manage) && active,
      skip: (own || manage) && t.status !== 'skipped',
      reopen: (own || manage) && !active,
      delete: (caller.role === 'manager' || t.createdById === caller.userId) && t.status !== 'done' && t.coatWorkId === null,
    },
    createdAt: new Date(t.createdAt).toISOString(),
    updatedAt: new Date(t.updatedAt).toISOString(),
  }
}

/** The caller's tasks matching a condition, as views. */
export async function loadTaskViews(caller: Caller, where: SqlWhere, today = callerToday(caller)): Promise<TaskView[]> {
  const [records, profiles] = await Promise.all([
    loadTaskRecords(caller, where, { today }),
    loadProfiles(kennelSequelize(), caller.organisationId),
  ])
  return records.map(t => taskView(caller, today, t, profiles.get(t.coatProfileId)))
}

/** A task the caller may see; 404 otherwise. With a transaction, the row is locked for a change. */
export async function requireTaskRecord(caller: Caller, id: number, transaction?: Transaction): Promise<TaskRecord> {
  if (id > MAX_ROW_ID) throw notFound('task')
  const [task] = await loadTaskRecords(caller, { sql: 't.id = :taskId', replacements: { taskId: id } }, { transaction })
  if (!task) throw notFound('task')
  return task
}

/** One task as its view; 404 when the caller may not see it. */
export async function requireTaskView(caller: Caller, id: number): Promise<TaskView> {
  const [view] = await loadTaskViews(caller, { sql: 't.id = :taskId', replacements: { taskId: id } })
  if (!view) throw notFound('task')
  return view
}

/** A 403 unless the caller is the task's assignee or runs it (finish, skip, reopen, start). */
export function requireWorkOn(caller: Caller, task: TaskRecord): void {
  const { own, manage } = taskAccess(caller, task)
  if (!own && !manage) throw forbidden('Only the person given this task, a manager, or the dog\'s handler may do this.')
}

/** A 403 unless the caller runs the task (assign, move, edit). */
export function requireManage(caller: Caller, task: TaskRecord): void {
  if (!taskAccess(caller, task).manage) throw forbidden('Only a manager, or the dog\'s handler, may change this task.')
}

/** The role of a member of the caller's organisation, or a 400 naming `field` when they are not one. */
async function memberRole(caller: Caller, userId: number, field: string): Promise<Role> {
  await requireMember(caller, userId, field)
  const membership = await useModels().Membership.findOne({ where: { userId, organisationId: caller.organisationId } })
  return membership!.role
}

/**
 * A 400 naming `field` unless the assignee is a member; a 403 when a handler gives a task to anyone
 * but an assistant or themselves (DESIGN.md §2: handlers assign to assistants).
 */
export async function checkAssignee(caller: Caller, assigneeId: number | null | undefined, field = 'assigneeId'): Promise<void> {
  if (assigneeId === null || assigneeId === undefined) return
  const role = await memberRole(caller, assigneeId, field)
  if (caller.role === 'handler' && assigneeId !== caller.userId && role !== 'assistant') {
    throw forbidden('A handler may give tasks to assistants or to themselves.')
  }
}

/** A dog of the caller's organisation, whatever their reach (the task's visibility has been checked already). */
export async function organisationDog(caller: Caller, dogId: number): Promise<DogRecord> {
  const [dog] = await loadDogRecords(kennelSequelize(), { sql: 'd.id = :dogId AND d.organisation_id = :organisationId', replacements: { dogId, organisationId: caller.organisationId } })
  if (!dog) throw notFound('dog')
  return dog
}

/** A 400 naming `regions` when a region is not in the dog's coat profile. */
export function checkTaskRegions(caller: Caller, dog: DogRecord, regions: string[] | undefined): Promise<void> {
  return checkWorkFields(caller, dog, { regions })
}

/** The dates of the "from the plan" action: the range given, or today and the coming weeks. */
export function planRange(today: ISODate, from?: ISODate, to?: ISODate): { from: ISODate, to: ISODate } {
  const start = from && from > today ? from : today
  return { from: start, to: to ?? addDays(start, PLAN_TASK_WEEKS * 7 - 1) }
}

/** A dog's work-back plan steps dated in a range, each with its stable key and the task already made from it. */
export async function planOffers(caller: Caller, dog: DogRecord, range: { from: ISODate, to: ISODate }, today = callerToday(caller)): Promise<PlanStepOffer[]> {
  const sequelize = kennelSequelize()
  const [profiles, pulls, shows] = await Promise.all([
    loadProfiles(sequelize, caller.organisationId),
    loadDogPulls(dog.id),
    loadLiveShows(sequelize, { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId: dog.id } }, today).then(m => m.get(dog.id) ?? []),
  ])
  const profile = profiles.get(dog.coatProfileId) ?? DEFAULT_PROFILE
  // As the plan route does: the plan starts from work already done.
  const plan = planWorkBack(profile, pulls.filter(w => w.date <= today), shows.map(s => s.firstDay), today)
  const steps = plan.steps.filter(s => s.date >= range.from && s.date <= range.to)
  const keys = steps.map(s => planStepKey(dog.id, s))
  const taken = keys.length
    ? await sequelize.query<{ id: number, key: string }>(
        'SELECT id, plan_step_key AS key FROM tasks WHERE dog_id = :dogId AND plan_step_key IN (:keys)',
        { type: QueryTypes.SELECT, raw: true, replacements: { dogId: dog.id, keys } })
    : []
  const taskByKey = new Map(taken.map(t => [t.key, t.id]))
  const labels = new Map(profile.regions.map(r => [r.key, r.label]))
  return steps.map((step, i) => ({
    key: keys[i]!,
    step,
    regionLabels: step.regions.map(r => labels.get(r) ?? r),
    taskId: taskByKey.get(keys[i]!) ?? null,
  }))
}

/** Soft-deletes the coat work a task recorded (kept in the log with who deleted it), audited. */
export async function removeTaskWork(caller: Caller, workId: number, transaction: Transaction): Promise<void> {
  const work = await useModels().CoatWorkRow.findOne({ where: { id: workId, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
  if (!work) return
  const before = auditSnapshot(work)
  await work.update({ deletedById: caller.userId }, { transaction })
  await work.destroy({ transaction })
  await recordAudit(caller, 'coat_work', workId, 'delete', { before, after: auditSnapshot(work) }, transaction)
}

/**
 * For a task that recorded coat work still in the log: the caller's choice whether to keep it,
 * a 400 naming `field` when they did not choose (never silent, issue 6).
 */
export function requireWorkChoice(task: TaskRecord, choice: boolean | undefined, field: string): boolean | undefined {
  if (task.coatWorkId === null) return undefined
  if (choice === undefined) throw invalidField(field, 'This task recorded coat work: choose whether to keep it or remove it')
  return choice
}

/** A 409 unless the task is still open or in progress. */
export function requireActive(task: TaskRecord, doing: string): void {
  if (task.status === 'done') throw conflict(`This task is already done; reopen it before you ${doing}.`)
  if (task.status === 'skipped') throw conflict(`This task was skipped; reopen it before you ${doing}.`)
}

/** A task row as the audit trail keeps it, read inside `transaction`; null once it is gone. */
export async function taskSnapshot(id: number, transaction: Transaction): Promise<Record<string, unknown> | null> {
  const row = await useModels().Task.findByPk(id, { transaction })
  return row ? auditSnapshot(row) : null
}

/**
 * Runs `change` on a task inside `transaction` and writes one audit row with the task before and
 * after it, so every change to a task (who moved, gave, ran, skipped, reopened or deleted it) is
 * on record with the coat work it recorded.
 */
export async function auditedTaskChange<T>(caller: Caller, id: number, action: 'update' | 'delete', transaction: Transaction, change: () => Promise<T>): Promise<T> {
  const before = await taskSnapshot(id, transaction)
  const result = await change()
  await recordAudit(caller, 'task', id, action, { before, after: action === 'delete' ? null : await taskSnapshot(id, transaction) }, transaction)
  return result
}

/** Writes a `create` audit row for each task just made inside `transaction`. */
export async function auditTasksCreated(caller: Caller, ids: readonly number[], transaction: Transaction): Promise<void> {
  if (!ids.length) return
  const rows = await useModels().Task.findAll({ where: { id: [...ids] }, transaction })
  for (const row of rows) await recordAudit(caller, 'task', row.id, 'create', { after: auditSnapshot(row) }, transaction)
}
