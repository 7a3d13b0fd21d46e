import { idParamSchema, memberPatchSchema } from '../../../shared/schemas/organisation'

/** Changes a member's role. Managers only; the organisation always keeps at least one manager. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const { id } = await paramsWith(event, idParamSchema)
  const { role } = await readBodyWith(event, memberPatchSchema)
  return useModels().sequelize.transaction(async (transaction) => {
    const { member, managerCount } = await lockMemberAmongManagers(caller, id, transaction)
    if (member.role === 'manager' && role !== 'manager' && managerCount <= 1) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'The organisation needs at least one manager: make someone else a manager first.' })
    }
    await member.update({ role }, { transaction })
    return memberView(member)
  })
})
