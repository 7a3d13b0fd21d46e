import { QueryTypes } from 'sequelize'
import { fromPlanSchema } from '../../../shared/schemas/tasks'
import type { FromPlanResult } from '../../../shared/types/tasks'

/**
 * Turns a dog's work-back plan steps into tasks in one action: the steps named by key, or every
 * step in a range (default: today and the coming weeks), each pre-filled with the step's regions,
 * kind, date and note. A step that already has a task is answered in `existing`, not duplicated
 * (the unique index tasks_plan_step holds even when two requests race).
 */
export default defineEventHandler(async (event): Promise<FromPlanResult> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const body = await readKennelBody(event, fromPlanSchema)
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, body.dogId, today)
  await checkAssignee(caller, body.assigneeId)
  // Keys name steps by date, so a named step is looked for in the whole plan, not only the coming weeks.
  const range = body.steps ? { from: today, to: '2199-12-31' } : planRange(today, body.from, body.to)
  const offers = await planOffers(caller, dog, range, today)
  let chosen = offers
  if (body.steps) {
    const byKey = new Map(offers.map(o => [o.key, o]))
    chosen = body.steps.map(({ key }, i) => {
      const offer = byKey.get(key)
      if (!offer) throw invalidField(`steps.${i}.key`, `Not a step of ${dog.callName}'s plan as it stands today`)
      return offer
    })
  }
  const sequelize = kennelSequelize()
  const createdIds = await sequelize.transaction(async (transaction) => {
    const ids: number[] = []
    for (const { key, step } of chosen) {
      const rows = await sequelize.query<{ id: number }>(
        `INSERT INTO tasks (organisation_id, dog_id, kind, regions, due_date, assignee_id, created_by_id, status, notes, plan_step_key, created_at, updated_at)
         VALUES (:organisationId, :dogId, :kind, ARRAY[:regions]::varchar(40)[], :dueDate, :assigneeId, :me, 'open', :notes, :key, now(), now())
         ON CONFLICT (dog_id, plan_step_key) WHERE plan_step_key IS NOT NULL DO NOTHING RETURNING id`,
        {
          type: QueryTypes.SELECT,
          raw: true,
          transaction,
          replacements: {
            organisationId: caller.organisationId, dogId: dog.id, kind: step.kind, regions: step.regions, dueDate: step.date,
            assigneeId: body.assigneeId ?? null, me: caller.userId, notes: step.note || null, key,
          },
        })
      ids.push(...rows.map(r => r.id))
    }
    await auditTasksCreated(caller, ids, transaction)
    return ids
  })
  const keys = [...new Set(chosen.map(o => o.key))]
  const views = keys.length
    ? await loadTaskViews(caller, { sql: 't.dog_id = :dogId AND t.plan_step_key IN (:keys)', replacements: { dogId: dog.id, keys } }, today)
    : []
  const created = new Set(createdIds)
  if (createdIds.length) setResponseStatus(event, 201)
  return { created: views.filter(v => created.has(v.id)), existing: views.filter(v => !created.has(v.id)) }
})
