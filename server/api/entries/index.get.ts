import { entryListQuerySchema } from '../../../shared/schemas/kennel'
import type { EntryView } from '../../../shared/types/kennel'

/** The entries the caller may see (managers all, handlers those of their dogs), filtered by ?show ?dog ?status, each with its class check and warnings. */
export default defineEventHandler(async (event): Promise<EntryView[]> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const query = await readKennelQuery(event, entryListQuerySchema)
  const conditions = [entryScopeCondition(caller, callerToday(caller), 'e')]
  const replacements: Record<string, unknown> = {}
  if (query.show !== undefined) {
    conditions.push('e.show_id = :show')
    replacements.show = query.show
  }
  if (query.dog !== undefined) {
    conditions.push('e.dog_id = :dog')
    replacements.dog = query.dog
  }
  if (query.status) {
    conditions.push('e.status = :status')
    replacements.status = query.status
  }
  const rows = await loadEntryRecords({ sql: conditions.join(' AND '), replacements })
  const ruleSet = callerRuleSet(caller)
  return rows.map(e => entryView(e, ruleSet))
})
