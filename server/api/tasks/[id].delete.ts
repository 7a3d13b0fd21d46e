/** Deletes a task: a manager or its creator, and only while it has recorded no coat work (reopen or skip a done task instead). */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  const { sequelize, Task } = useModels()
  await sequelize.transaction(async (transaction) => {
    const task = await requireTaskRecord(caller, id, transaction)
    if (caller.role !== 'manager' && task.createdById !== caller.userId) {
      throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Only a manager or the person who made this task may delete it.' })
    }
    if (task.status === 'done' || task.coatWorkId !== null) throw conflict('This task recorded coat work; reopen or skip it instead of deleting it.')
    await auditedTaskChange(caller, id, 'delete', transaction, () => Task.destroy({ where: { id }, transaction }))
  })
  setResponseStatus(event, 204)
  return null
})
