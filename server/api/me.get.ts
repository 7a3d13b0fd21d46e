import type { MeView } from '../../shared/types/organisation'

/** The signed-in user, their active organisation and role, and every organisation they belong to. */
export default defineEventHandler(async (event): Promise<MeView> => {
  const { token, user } = await requireUser(event)
  const { Membership, Organisation } = useModels()
  const memberships = await Membership.findAll({
    where: { userId: user.id },
    include: [{ model: Organisation, as: 'organisation' }],
    order: [[{ model: Organisation, as: 'organisation' }, 'name', 'ASC']],
  })
  const active = memberships.find(m => m.organisationId === token.organisationId)
  return {
    user: { id: user.id, name: user.name, email: user.email },
    organisation: active?.organisation ? organisationView(active.organisation) : null,
    role: active?.role ?? null,
    memberships: memberships.map(m => ({ organisation: organisationView(m.organisation!), role: m.role })),
  }
})
