import type { Role } from '#shared/types/organisation'
import { mayOpen } from '#shared/navigation'

/**
 * Sends a signed-in user without an active organisation to the picker, and a role away from pages
 * it may not use. Pages open to anyone (`auth: false`: an invitation, a password reset, an
 * unsubscribe) are left alone, so a person in no organisation can still accept an invitation.
 */
export default defineNuxtRouteMiddleware((to) => {
  if (to.meta.auth === false) return
  const { session, role } = useCaller()
  if (!session.value) return
  if (!session.value.organisation && to.path !== '/organisations') return navigateTo('/organisations')
  if (!mayOpen(role.value, to.meta.roles as Role[] | undefined)) return navigateTo('/')
})
