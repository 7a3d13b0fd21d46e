import { Op } from 'sequelize'

/**
 * Removes a member from the organisation. Managers only; the organisation always keeps at least
 * one manager (409). It takes effect on the person's very next request (requireCaller reads the
 * membership every time), and their open tasks here go back to nobody, so none waits on a person
 * who can no longer see it. Their account, other memberships and past work stay.
 */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'member')
  const { Task, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const { member, managerCount } = await lockMemberAmongManagers(caller, id, transaction)
    if (member.role === 'manager' && managerCount <= 1) {
      throw conflict('The organisation needs at least one manager: make someone else a manager before removing this one.')
    }
    // Each task taken off them is a task change like any other, so each is in the audit trail.
    const tasks = await Task.findAll({
      attributes: ['id'],
      where: { organisationId: caller.organisationId, assigneeId: member.userId, status: { [Op.in]: ['open', 'in-progress'] } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    for (const { id: taskId } of tasks) {
      await auditedTaskChange(caller, taskId, 'update', transaction, () => Task.update({ assigneeId: null }, { where: { id: taskId }, transaction }))
    }
    await member.destroy({ transaction })
    // A weekly status still waiting for them holds the kennel's news: withdraw it.
    await cancelWaitingMail({ organisationId: caller.organisationId, kind: 'weekly_status', recipientEmail: member.user!.email })
  })
  setResponseStatus(event, 204)
  return null
})
