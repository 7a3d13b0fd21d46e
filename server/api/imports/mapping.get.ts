import type { ImportMapping } from '../../../shared/import'

/** The column mapping the organisation used last (empty when none yet). Managers only. */
export default defineEventHandler(async (event): Promise<{ mapping: ImportMapping }> => {
  const caller = await requireCaller(event, ['manager'])
  return { mapping: await rememberedMapping(caller) }
})
