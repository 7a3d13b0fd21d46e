import type { Role } from '#shared/types/organisation'

/** The session as Bloomline reads it: who is signed in, where they work and in what role. */
export interface CallerSession {
  user: { id: number, name: string, email: string }
  organisation: { id: number, name: string } | null
  role: Role | null
  organisationCount: number
}

/** The signed-in caller from the session, as computed refs. */
export function useCaller() {
  const { data, status } = useAuth()
  const session = computed(() => (data.value as unknown as CallerSession | null) ?? null)
  return {
    status,
    session,
    user: computed(() => session.value?.user ?? null),
    organisation: computed(() => session.value?.organisation ?? null),
    role: computed<Role | null>(() => session.value?.role ?? null),
  }
}
