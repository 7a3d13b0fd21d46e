import { importRequestSchema, type ImportPreviewView } from '../../../shared/import'

/** Previews an import: how the file reads, the proposed mapping, and what each row would do with its problems. Writes nothing. Managers only. */
export default defineEventHandler(async (event): Promise<ImportPreviewView> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readBodyWith(event, importRequestSchema)
  const { parsed, mapping, preview } = await previewImport(caller, body)
  return previewView(body, parsed, mapping, preview)
})
