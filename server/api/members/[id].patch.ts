import { idParamSchema, memberPatchSchema } from '../../../shared/schemas/organisation'

/** Changes a member's role. Managers only; the organisation always keeps at least one manager. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const { id } = await paramsWith(event, idParamSchema)
  const { role } = await readBodyWith(event, memberPatchSchema)
  const { Membership, User, sequelize } = useModels()
  return sequelize.transaction(async (transaction) => {
    // Lock the managers' rows first, so two managers demoting each other at once cannot leave none.
    const managers = await Membership.findAll({
      where: { organisationId: caller.organisationId, role: 'manager' },
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    const member = await Membership.findOne({
      where: { id, organisationId: caller.organisationId },
      include: [{ model: User, as: 'user', required: true }],
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    if (!member) throw notFound('member')
    if (member.role === 'manager' && role !== 'manager' && managers.length <= 1) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'The organisation needs at least one manager: make someone else a manager first.' })
    }
    await member.update({ role }, { transaction })
    return memberView(member)
  })
})
