/** Moves the session to another of the user's organisations, then reloads every page's data. */
export function useOrganisationSwitch() {
  const { getCsrfToken, getSession } = useAuth()
  const switching = ref(false)
  const error = ref<string | null>(null)

  async function switchTo(organisationId: number) {
    switching.value = true
    error.value = null
    try {
      const csrfToken = await getCsrfToken()
      // next-auth's session update: the jwt callback checks the membership before it moves the token.
      await $fetch('/api/auth/session', { method: 'POST', body: { csrfToken, data: { organisationId } } })
      await getSession()
      clearNuxtData()
      await navigateTo('/')
    }
    catch {
      error.value = 'Could not switch organisation. Check your connection and try again.'
    }
    finally {
      switching.value = false
    }
  }

  return { switchTo, switching, error }
}
