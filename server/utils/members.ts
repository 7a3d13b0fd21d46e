import type { Transaction } from 'sequelize'
import type { Caller } from './auth'

/**
 * A member of the caller's organisation, locked for a change, and how many managers it has. The
 * managers' rows are locked first, so two managers demoting or removing each other at once cannot
 * leave the organisation with none. 404 for anyone not in it.
 */
export async function lockMemberAmongManagers(caller: Caller, id: number, transaction: Transaction) {
  const { Membership, User } = useModels()
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
  return { member, managerCount: managers.length }
}
