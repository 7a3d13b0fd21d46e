/** A show's entries as a CSV download that imports back unchanged; managers every entry, handlers those of the dogs they see (owner contact as the dog page gives them). */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const id = await readRecordId(event, 'show')
  const show = await requireShowView(caller, id)
  const rows = await loadShowEntriesForExport(caller, callerToday(caller), show.id)
  return sendCsv(event, `entries-${fileNamePart(show.name)}-${show.firstDay}.csv`, rows, entryExportColumns(callerRuleSet(caller)))
})
