import { importMappingSchema, type ImportMapping } from '../../../shared/import'

/** Remembers a column mapping for the organisation's next file. Managers only. */
export default defineEventHandler(async (event): Promise<{ mapping: ImportMapping }> => {
  const caller = await requireCaller(event, ['manager'])
  const { mapping } = await readBodyWith(event, importMappingSchema)
  await rememberMapping(caller, mapping)
  return { mapping }
})
