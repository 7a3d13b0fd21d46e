import { workListQuerySchema } from '../../../../shared/schemas/kennel'
import type { CoatWorkLogItem } from '../../../../shared/types/kennel'

/** A dog's coat-work log, newest first; `?deleted=true` (managers) lists deleted work too, marked. */
export default defineEventHandler(async (event): Promise<CoatWorkLogItem[]> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const query = await readKennelQuery(event, workListQuerySchema)
  if (query.deleted === 'true' && caller.role !== 'manager') {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Only managers may list deleted coat work.' })
  }
  await requireDogRecord(caller, id)
  const conditions = ['w.dog_id = :dogId', 'w.organisation_id = :organisationId']
  const replacements: Record<string, unknown> = { dogId: id, organisationId: caller.organisationId }
  if (query.deleted !== 'true') conditions.push('w.deleted_at IS NULL')
  if (query.region) {
    conditions.push(':region = ANY(w.regions)')
    replacements.region = query.region
  }
  if (query.from) {
    conditions.push('w.date >= :from')
    replacements.from = query.from
  }
  if (query.to) {
    conditions.push('w.date <= :to')
    replacements.to = query.to
  }
  const rows = await loadWorkRecords({ sql: conditions.join(' AND '), replacements })
  return rows.map(w => coatWorkView(caller, w))
})
