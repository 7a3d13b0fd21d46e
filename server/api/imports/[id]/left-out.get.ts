import { CSV_MEDIA_TYPE } from '../../../../shared/csv'
import { leftOutCsv } from '../../../../shared/import'

/** The rows an import left out, with their reasons, as a CSV download (cells neutralised). Managers only. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'import')
  const record = await useModels().ImportRecord.findOne({ where: { id, organisationId: caller.organisationId } })
  if (!record) throw notFound('import')
  setResponseHeader(event, 'content-type', CSV_MEDIA_TYPE)
  setResponseHeader(event, 'content-disposition', `attachment; filename="import-${record.id}-left-out.csv"`)
  return leftOutCsv(record.leftOut.headers, record.leftOut.rows)
})
