import type { z } from 'zod'

/**
 * A form checked as you type with the same zod schema the server uses. Errors are keyed by field
 * path ('regions', 'judges.0'); a field shows its error once touched or after a submit. When the
 * server refuses (400 with `data.fields`), its messages land on the same fields and what was
 * typed stays in the form.
 */
export function useZodForm<S extends z.ZodType>(schema: S, initial: () => Record<string, unknown>) {
  const values = reactive(initial()) as Record<string, unknown>
  const touched = reactive(new Set<string>())
  const submitted = ref(false)
  const serverErrors = ref<Record<string, string>>({})
  const formError = ref<string | null>(null)
  const pending = ref(false)

  const result = computed(() => schema.safeParse(values))
  const errors = computed<Record<string, string>>(() => {
    const out: Record<string, string> = {}
    if (!result.value.success) {
      for (const issue of result.value.error.issues) {
        const key = issue.path.join('.') || '_form'
        out[key] ??= issue.message
      }
    }
    return { ...out, ...serverErrors.value }
  })

  /** The message to show beside a field, or null. */
  function errorFor(field: string): string | null {
    if (!submitted.value && !touched.has(field)) return null
    return errors.value[field] ?? null
  }

  /** Marks a field as visited, so its error shows. */
  function touch(field: string) {
    touched.add(field)
    if (serverErrors.value[field]) {
      const { [field]: _, ...rest } = serverErrors.value
      serverErrors.value = rest
    }
  }

  /** Validates, then runs `send` with the parsed data; maps a 400's field messages back onto the form. */
  async function submit(send: (data: z.infer<S>) => Promise<void>) {
    submitted.value = true
    formError.value = null
    serverErrors.value = {}
    const parsed = schema.safeParse(values)
    if (!parsed.success) {
      formError.value = 'Some fields need attention.'
      return false
    }
    pending.value = true
    try {
      await send(parsed.data)
      return true
    }
    catch (error: unknown) {
      const data = (error as { data?: { message?: string, data?: { fields?: Record<string, string> } } }).data
      serverErrors.value = data?.data?.fields ?? {}
      formError.value = data?.message ?? 'Could not save. Check your connection and try again.'
      return false
    }
    finally {
      pending.value = false
    }
  }

  /** Puts the form back to its first values. */
  function reset() {
    Object.assign(values, initial())
    touched.clear()
    submitted.value = false
    serverErrors.value = {}
    formError.value = null
  }

  return { values, errors, errorFor, touch, submit, reset, pending, formError, valid: computed(() => result.value.success) }
}
