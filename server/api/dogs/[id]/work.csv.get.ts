/** A dog's coat-work log (not deleted), newest first, as a CSV download; anyone who may see the dog. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const dog = await requireDogRecord(caller, id)
  const [work, profile] = await Promise.all([
    loadWorkRecords({ sql: 'w.dog_id = :dogId AND w.organisation_id = :organisationId AND w.deleted_at IS NULL', replacements: { dogId: dog.id, organisationId: caller.organisationId } }),
    findProfile(caller, dog.coatProfileId),
  ])
  return sendCsv(event, `coat-work-${fileNamePart(dog.callName)}-${callerToday(caller)}.csv`, work, workExportColumns(profile?.regions ?? []))
})
