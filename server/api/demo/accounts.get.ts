import { DEMO_ACCOUNTS } from '../../../seeders/accounts'

/** The invented demo sign-ins, shown on the sign-in page, and only while the app runs as the demo. */
export default defineEventHandler(() => {
  if (!useRuntimeConfig().public.demoMode) throw notFound('page')
  return DEMO_ACCOUNTS.map(({ name, email, password, memberships }) => ({ name, email, password, memberships }))
})
