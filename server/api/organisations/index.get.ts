/** Every organisation the signed-in user belongs to, with their role, for the organisation picker. */
export default defineEventHandler(async (event) => {
  const { token } = await requireUser(event)
  const { Membership, Organisation } = useModels()
  const memberships = await Membership.findAll({
    where: { userId: token.userId },
    include: [{ model: Organisation, as: 'organisation', required: true }],
    order: [[{ model: Organisation, as: 'organisation' }, 'name', 'ASC']],
  })
  return memberships.map(m => ({
    organisation: organisationView(m.organisation!),
    role: m.role,
    active: m.organisationId === token.organisationId,
  }))
})
