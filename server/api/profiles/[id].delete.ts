/** Deletes a coat profile. Managers only; the default profile, and a profile dogs still use, are a 409. Audited. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'coat profile')
  const { CoatProfileRow, Dog, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const row = await CoatProfileRow.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!row) throw notFound('coat profile')
    if (row.isDefault) throw conflict('The default coat profile cannot be deleted: new dogs get it.')
    const dogs = await Dog.count({ where: { coatProfileId: id }, transaction })
    if (dogs) throw conflict(`${dogs} ${dogs === 1 ? 'dog uses' : 'dogs use'} ${row.label}; give them another profile first.`)
    const before = auditSnapshot(row)
    await row.destroy({ transaction })
    await recordAudit(caller, 'coat_profile', id, 'delete', { before }, transaction)
  })
  setResponseStatus(event, 204)
  return null
})
