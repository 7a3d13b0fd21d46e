import { idParamSchema } from '../../../shared/schemas/organisation'

/** One member of the active organisation; a member of another organisation is a 404. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const { id } = await paramsWith(event, idParamSchema)
  const { Membership, User } = useModels()
  const member = await Membership.findOne({
    where: { id, organisationId: caller.organisationId },
    include: [{ model: User, as: 'user' }],
  })
  if (!member) throw notFound('member')
  return memberView(member)
})
