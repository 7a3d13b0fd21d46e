import { finishSchema } from '../../../../shared/schemas/tasks'
import type { TaskView } from '../../../../shared/types/tasks'

/**
 * Finishes a task in one transaction: records one piece of coat work of the task's kind on its
 * regions, dated the chosen day (today by default), by the assignee, with the minutes and notes;
 * links it to the task and marks the task done. Finishing a done task is a 409.
 */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  const body = await readKennelBody(event, finishSchema)
  const today = callerToday(caller)
  const { sequelize, CoatWorkRow, Task } = useModels()
  await sequelize.transaction(async (transaction) => {
    // The lock makes a second finish wait for the first and then see the task done.
    const task = await requireTaskRecord(caller, id, transaction)
    requireWorkOn(caller, task)
    requireActive(task, 'finish it again')
    const dog = await organisationDog(caller, task.dogId)
    const date = body.date ?? today
    await checkWorkFields(caller, dog, { date, workedById: body.workedById })
    const minutes = body.minutes !== undefined ? body.minutes : task.minutes
    const work = await CoatWorkRow.create({
      organisationId: caller.organisationId,
      dogId: task.dogId,
      date,
      kind: task.kind,
      regions: task.regions,
      workedById: body.workedById ?? task.assigneeId ?? caller.userId,
      recordedById: caller.userId,
      minutes,
      notes: body.notes ?? null,
      taskId: task.id,
      deletedById: null,
    }, { transaction })
    await recordAudit(caller, 'coat_work', work.id, 'create', { after: auditSnapshot(work) }, transaction)
    await auditedTaskChange(caller, id, 'update', transaction, () => Task.update({ status: 'done', doneAt: new Date(), coatWorkId: work.id, minutes, skipReason: null }, { where: { id }, transaction }))
  })
  return requireTaskView(caller, id)
})
