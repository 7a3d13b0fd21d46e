/** Deletes an entry. Managers only (to keep a record of it, set its status to withdrawn instead); audited. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'entry')
  const { Entry, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const entry = await Entry.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!entry) throw notFound('entry')
    const before = auditSnapshot(entry)
    await entry.destroy({ transaction })
    await recordAudit(caller, 'entry', id, 'delete', { before }, transaction)
  })
  setResponseStatus(event, 204)
  return null
})
