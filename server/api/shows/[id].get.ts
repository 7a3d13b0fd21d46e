import type { ShowView } from '../../../shared/types/kennel'

/** One show the caller may see (managers every show, handlers the shows their dogs are entered in). */
export default defineEventHandler(async (event): Promise<ShowView> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const id = await readRecordId(event, 'show')
  return requireShowView(caller, id)
})
