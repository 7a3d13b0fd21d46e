import { taskPatchSchema } from '../../../shared/schemas/tasks'
import type { WorkKind } from '../../../shared/coat'
import type { TaskView } from '../../../shared/types/tasks'

// What the person given a task may change on it without running it: starting it, and the timer's minutes.
const ASSIGNEE_FIELDS = new Set(['status', 'minutes'])

/**
 * Assigns, moves or edits a task. Managers and the dog's handler change anything (a handler gives
 * tasks to assistants or themselves); the assignee only starts or pauses it and records minutes.
 * A done or skipped task takes only new notes until it is reopened.
 */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  const patch = await readKennelBody(event, taskPatchSchema)
  const { sequelize, Task } = useModels()
  await sequelize.transaction(async (transaction) => {
    const task = await requireTaskRecord(caller, id, transaction)
    const { own, manage } = taskAccess(caller, task)
    if (!manage) {
      if (!own) requireManage(caller, task)
      const other = Object.keys(patch).find(k => !ASSIGNEE_FIELDS.has(k))
      if (other) throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: `The person given a task may start it and record minutes, not change ${other}.` })
    }
    if (Object.keys(patch).some(k => k !== 'notes')) requireActive(task, 'change it')
    if (patch.regions) await checkTaskRegions(caller, await organisationDog(caller, task.dogId), patch.regions)
    if (patch.assigneeId !== undefined) await checkAssignee(caller, patch.assigneeId)
    const start = patch.windowStart !== undefined ? patch.windowStart : task.windowStart
    const end = patch.windowEnd !== undefined ? patch.windowEnd : task.windowEnd
    if (start && end && start >= end) throw invalidField('windowEnd', 'The window must end after it starts')
    const { kind, regions, ...rest } = patch
    await auditedTaskChange(caller, id, 'update', transaction, () => Task.update({
      ...rest,
      ...(kind ? { kind: kind as WorkKind } : {}),
      ...(regions ? { regions: [...new Set(regions)] } : {}),
    }, { where: { id }, transaction }))
  })
  return requireTaskView(caller, id)
})
