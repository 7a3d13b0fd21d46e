import type { H3Event } from 'h3'
import type { z } from 'zod'

/** Turns a zod failure into one readable sentence that names each field. */
export function describeIssues(error: z.ZodError): string {
  return error.issues
    .map(issue => (issue.path.length ? `${issue.path.join('.')}: ` : '') + issue.message)
    .join('; ')
}

function badRequest(message: string, fields?: Record<string, string>) {
  return createError({ statusCode: 400, statusMessage: 'Bad Request', message, data: fields ? { fields } : undefined })
}

function fieldMap(error: z.ZodError): Record<string, string> {
  return Object.fromEntries(error.issues.map(issue => [issue.path.join('.') || '(body)', issue.message]))
}

// PostgreSQL text cannot hold a NUL character; refuse it here, for every route, naming the field.
function findNul(value: unknown, path: string[]): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? (path.join('.') || '(body)') : null
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const hit = findNul(value[i], [...path, String(i)])
      if (hit) return hit
    }
  }
  else if (value && typeof value === 'object') {
    for (const [key, v] of Object.entries(value)) {
      const hit = findNul(v, [...path, key])
      if (hit) return hit
    }
  }
  return null
}

function parseWith<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const nul = findNul(value, [])
  if (nul) throw badRequest(`${nul}: Text may not contain a NUL character`, { [nul]: 'Text may not contain a NUL character' })
  const result = schema.safeParse(value)
  if (!result.success) throw badRequest(describeIssues(result.error), fieldMap(result.error))
  return result.data
}

/** The request body checked against a schema: malformed JSON and a bad field are both a 400 that says why. */
export async function readBodyWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  let result: z.infer<S> | undefined
  try {
    result = await readValidatedBody(event, body => parseWith(schema, body ?? {}))
  }
  catch (error: unknown) {
    const err = error as { statusCode?: number, data?: unknown, message?: string }
    // h3 wraps the validator's own error in its "Validation Error"; give back ours.
    if (err.data && typeof err.data === 'object' && 'statusCode' in err.data) throw err.data
    if (err.statusCode === 400 || error instanceof SyntaxError) throw badRequest('The request body is not valid JSON.')
    throw error
  }
  return result
}

/** Route parameters checked against a schema (400 naming the parameter). */
export function paramsWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  return getValidatedRouterParams(event, params => parseWith(schema, params)).catch(unwrap)
}

/** Query parameters checked against a schema (400 naming the parameter). */
export function queryWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  return getValidatedQuery(event, query => parseWith(schema, query)).catch(unwrap)
}

function unwrap(error: { data?: unknown }): never {
  if (error.data && typeof error.data === 'object' && 'statusCode' in error.data) throw error.data
  throw error
}
