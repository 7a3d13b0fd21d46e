import type { EntryView } from '../../../shared/types/kennel'

/** One entry the caller may see, with its class check and warnings. */
export default defineEventHandler(async (event): Promise<EntryView> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const id = await readRecordId(event, 'entry')
  return requireEntryView(caller, id)
})
