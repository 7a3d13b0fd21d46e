import { showListQuerySchema } from '../../../shared/schemas/kennel'
import type { ShowView } from '../../../shared/types/kennel'

/**
 * The shows the caller may see (managers every show, handlers the shows their dogs are entered
 * in): by default those not yet over, soonest first; `?past=true` those over, latest first;
 * `?from=`/`?to=` bound the first day (with neither `past` nor a bound, only shows not yet over).
 */
export default defineEventHandler(async (event): Promise<ShowView[]> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const query = await readKennelQuery(event, showListQuerySchema)
  const today = callerToday(caller)
  const conditions = [showScopeCondition(caller, today, 's')]
  const replacements: Record<string, unknown> = { today }
  if (query.past === 'true') conditions.push('s.last_day < :today')
  else if (query.past === 'false' || (!query.from && !query.to)) conditions.push('s.last_day >= :today')
  if (query.from) {
    conditions.push('s.first_day >= :from')
    replacements.from = query.from
  }
  if (query.to) {
    conditions.push('s.first_day <= :to')
    replacements.to = query.to
  }
  const order = query.past === 'true' ? 's.first_day DESC, s.id DESC' : 's.first_day, s.id'
  const rows = await loadShowRecords(caller, today, { sql: conditions.join(' AND '), replacements }, order)
  return rows.map(s => showView(s, Number(s.entryCount)))
})
