/**
 * Deletes a dog entered by mistake. Managers only. A dog with coat work, entries or tasks keeps
 * its record (409): retire it instead, so nothing logged is lost. The deletion is audited.
 */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'dog')
  const { Dog, CoatWorkRow, Entry, Task, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const dog = await Dog.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!dog) throw notFound('dog')
    // One after another: the transaction's one connection runs one query at a time.
    const work = await CoatWorkRow.count({ where: { dogId: id }, paranoid: false, transaction })
    const entries = await Entry.count({ where: { dogId: id }, transaction })
    const tasks = await Task.count({ where: { dogId: id }, transaction })
    if (work + entries + tasks > 0) {
      throw conflict(`${dog.callName} has coat work, entries or tasks on record; retire the dog (status "retired") instead of deleting it.`)
    }
    const before = auditSnapshot(dog)
    await dog.destroy({ transaction })
    await recordAudit(caller, 'dog', id, 'delete', { before }, transaction)
  })
  setResponseStatus(event, 204)
  return null
})
