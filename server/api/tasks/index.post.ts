import { taskCreateSchema } from '../../../shared/schemas/tasks'
import type { WorkKind } from '../../../shared/coat'
import type { TaskView } from '../../../shared/types/tasks'

/** Creates a task: managers on any dog for anyone; handlers on their own dogs, for assistants or themselves. */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const body = await readKennelBody(event, taskCreateSchema)
  const dog = await requireDogRecord(caller, body.dogId)
  await checkTaskRegions(caller, dog, body.regions)
  await checkAssignee(caller, body.assigneeId)
  const { sequelize, Task } = useModels()
  const task = await uniquely(() => sequelize.transaction(async (transaction) => {
    const made = await Task.create({
      organisationId: caller.organisationId,
      dogId: dog.id,
      kind: body.kind as WorkKind,
      regions: [...new Set(body.regions)],
      dueDate: body.dueDate,
      windowStart: body.windowStart ?? null,
      windowEnd: body.windowEnd ?? null,
      assigneeId: body.assigneeId ?? null,
      createdById: caller.userId,
      skipReason: null,
      minutes: null,
      notes: body.notes ?? null,
      planStepKey: body.planStepKey ?? null,
      coatWorkId: null,
      doneAt: null,
    }, { transaction })
    await auditTasksCreated(caller, [made.id], transaction)
    return made
  }), 'This plan step already has a task; open that one instead.')
  setResponseStatus(event, 201)
  return requireTaskView(caller, task.id)
})
