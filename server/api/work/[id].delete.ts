/**
 * Deletes a piece of coat work: its author or a manager only. The row is kept with who deleted
 * it and when (managers still list it with ?deleted=true), readiness stops counting it, and the
 * deletion is audited.
 */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'coat work')
  const { sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const { work } = await requireEditableWork(caller, id, transaction)
    const before = auditSnapshot(work)
    // Sequelize sets deletedAt only through destroy() on a paranoid model, so the deleter goes first.
    await work.update({ deletedById: caller.userId }, { transaction })
    await work.destroy({ transaction })
    await recordAudit(caller, 'coat_work', id, 'delete', { before, after: auditSnapshot(work) }, transaction)
  })
  setResponseStatus(event, 204)
  return null
})
