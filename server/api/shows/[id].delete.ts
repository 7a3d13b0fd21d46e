/** Deletes a show with no entries. Managers only; a show with entries is a 409 (delete or move them first). Audited. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'show')
  const { Show, Entry, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const show = await Show.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!show) throw notFound('show')
    const entries = await Entry.count({ where: { showId: id }, transaction })
    if (entries) throw conflict(`${show.name} has ${entries} ${entries === 1 ? 'entry' : 'entries'}; delete them first, so no entry is lost by accident.`)
    const before = auditSnapshot(show)
    await show.destroy({ transaction })
    await recordAudit(caller, 'show', id, 'delete', { before }, transaction)
  })
  setResponseStatus(event, 204)
  return null
})
