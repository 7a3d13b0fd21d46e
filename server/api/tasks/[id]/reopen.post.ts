import { reopenSchema } from '../../../../shared/schemas/tasks'
import type { TaskView } from '../../../../shared/types/tasks'

/**
 * Reopens a done or skipped task. When it recorded coat work still in the log, `keepWork` must
 * choose: false soft-deletes that work (readiness stops counting it), true keeps it; never silent.
 */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  const body = await readKennelBody(event, reopenSchema)
  const { sequelize, Task } = useModels()
  await sequelize.transaction(async (transaction) => {
    const task = await requireTaskRecord(caller, id, transaction)
    requireWorkOn(caller, task)
    if (task.status === 'open' || task.status === 'in-progress') throw conflict('This task is already open.')
    const keep = requireWorkChoice(task, body.keepWork, 'keepWork')
    if (keep === false) await removeTaskWork(caller, task.coatWorkId!, transaction)
    // Kept work stays in the log (still naming the task); finishing again records new work.
    await auditedTaskChange(caller, id, 'update', transaction, () => Task.update({ status: 'open', doneAt: null, skipReason: null, coatWorkId: null }, { where: { id }, transaction }))
  })
  return requireTaskView(caller, id)
})
