import { z } from 'zod'
import { importRequestSchema, type ImportCommitView } from '../../../shared/import'

const commitSchema = importRequestSchema.extend({ commit: z.literal(true, 'Send commit: true to write the import') })

/** Commits an import: checks the file again as the preview does, then writes every chosen row in one transaction or none. Managers only. */
export default defineEventHandler(async (event): Promise<ImportCommitView> => {
  const timer = stepTimer()
  const caller = await requireCaller(event, ['manager'])
  timer.step('caller')
  const body = await readBodyWith(event, commitSchema)
  timer.step('body')
  const result = await commitImport(caller, body, timer)
  setResponseStatus(event, 201)
  setResponseHeader(event, 'server-timing', timer.header())
  return result
})
