import { skipSchema } from '../../../../shared/schemas/tasks'
import type { TaskView } from '../../../../shared/types/tasks'

/** Skips a task with a reason; when it had recorded coat work, `removeWork` must say whether that work goes (soft-deleted) or stays. */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  const body = await readKennelBody(event, skipSchema)
  const { sequelize, Task } = useModels()
  await sequelize.transaction(async (transaction) => {
    const task = await requireTaskRecord(caller, id, transaction)
    requireWorkOn(caller, task)
    if (task.status === 'skipped') throw conflict('This task is already skipped.')
    const remove = requireWorkChoice(task, body.removeWork, 'removeWork')
    if (remove) await removeTaskWork(caller, task.coatWorkId!, transaction)
    await auditedTaskChange(caller, id, 'update', transaction, () => Task.update({
      status: 'skipped',
      skipReason: body.reason,
      doneAt: null,
      ...(remove ? { coatWorkId: null } : {}),
    }, { where: { id }, transaction }))
  })
  return requireTaskView(caller, id)
})
