/** The team of the active organisation. Managers and handlers. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const { Membership, User } = useModels()
  const members = await Membership.findAll({
    where: { organisationId: caller.organisationId },
    include: [{ model: User, as: 'user' }],
    order: [['role', 'DESC'], [{ model: User, as: 'user' }, 'name', 'ASC']],
  })
  return members.map(memberView)
})
