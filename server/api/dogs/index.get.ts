import { dogListQuerySchema } from '../../../shared/schemas/kennel'
import type { DogSummary } from '../../../shared/types/kennel'

const escapeLike = (text: string) => text.replace(/[\\%_]/g, '\\$&')

/** The dogs the caller may see (active unless ?status=), filtered, each with its next show and readiness. */
export default defineEventHandler(async (event): Promise<DogSummary[]> => {
  const caller = await requireCaller(event)
  const query = await readKennelQuery(event, dogListQuerySchema)
  if (query.show !== undefined && !seesEntries(caller.role)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Assistants do not see entries, so cannot filter dogs by show.' })
  }
  const today = callerToday(caller)
  const conditions = [dogScopeCondition(caller, today, 'd')]
  const replacements: Record<string, unknown> = {}
  const status = query.status ?? 'active'
  if (status !== 'all') {
    conditions.push('d.status = :status')
    replacements.status = status
  }
  if (query.search) {
    conditions.push(`(d.call_name ILIKE :search ESCAPE '\\' OR d.registered_name ILIKE :search ESCAPE '\\' OR d.registration_number ILIKE :search ESCAPE '\\')`)
    replacements.search = `%${escapeLike(query.search)}%`
  }
  if (query.breed) {
    conditions.push('lower(d.breed) = lower(:breed)')
    replacements.breed = query.breed
  }
  if (query.handler !== undefined) {
    conditions.push('d.handler_id = :handler')
    replacements.handler = query.handler
  }
  if (query.show !== undefined) {
    conditions.push(`EXISTS (SELECT 1 FROM entries fe WHERE fe.dog_id = d.id AND fe.show_id = :show AND fe.status IN ${LIVE_STATUSES_SQL})`)
    replacements.show = query.show
  }
  const { summaries } = await loadDogSummaries(caller, today, { sql: conditions.join(' AND '), replacements })
  return summaries
})
