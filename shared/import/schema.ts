import { z } from 'zod'
import { MAX_IMPORT_BYTES } from './decode'
import { IMPORT_FIELDS } from './fields'

// Base64 takes 4 characters for every 3 bytes (RFC 4648 §4); padding adds at most 2.
const MAX_BASE64 = Math.ceil(MAX_IMPORT_BYTES / 3) * 4 + 4

const mappingSchema = z.partialRecord(z.enum(IMPORT_FIELDS), z.string().max(500))

/** A preview or commit request: the file as base64 and the choices made so far. */
export const importRequestSchema = z.object({
  fileName: z.string().trim().min(1).max(255),
  contentBase64: z.string().max(MAX_BASE64 + 16, 'The file is larger than 10 MB').regex(/^[A-Za-z0-9+/=\s]*$/, 'Not base64'),
  mapping: mappingSchema.optional(),
  dayFirst: z.boolean().optional(),
  exclude: z.array(z.number().int().min(1)).max(200_000).optional(),
  fixes: z.array(z.object({ row: z.number().int().min(1), field: z.enum(IMPORT_FIELDS), value: z.string().max(500) })).max(10_000).optional(),
  commit: z.literal(true).optional(),
})

export type ImportRequest = z.infer<typeof importRequestSchema>

/** The mapping memory's body. */
export const importMappingSchema = z.object({ mapping: mappingSchema })
