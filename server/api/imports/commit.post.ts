import { z } from 'zod'
import { importRequestSchema, type ImportCommitView } from '../../../shared/import'

const commitSchema = importRequestSchema.extend({ commit: z.literal(true, 'Send commit: true to write the import') })

/** Commits an import: checks the file again as the preview does, then writes every chosen row in one transaction or none. Managers only. */
export default defineEventHandler(async (event): Promise<ImportCommitView> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readBodyWith(event, commitSchema)
  const result = await commitImport(caller, body)
  setResponseStatus(event, 201)
  return result
})
