import { Op, type WhereOptions } from 'sequelize'
import { deliveryQuerySchema } from '../../../../shared/schemas/mail'
import type { MailOutbox } from '../../../database/models'
import type { DeliveryLogView } from '../../../../shared/types/mail'

/** The delivery log: what was sent to whom and when, newest first, with failures counted. Managers only. */
export default defineEventHandler(async (event): Promise<DeliveryLogView> => {
  const caller = await requireCaller(event, ['manager'])
  const query = await queryWith(event, deliveryQuerySchema)
  const { MailOutbox } = useModels()
  const where: WhereOptions<MailOutbox> = { organisationId: caller.organisationId }
  if (query.status) Object.assign(where, { status: query.status })
  if (query.kind) Object.assign(where, { kind: query.kind })
  const [rows, failedCount, waitingCount] = await Promise.all([
    MailOutbox.findAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: query.limit }),
    MailOutbox.count({ where: { organisationId: caller.organisationId, status: 'failed' } }),
    MailOutbox.count({ where: { organisationId: caller.organisationId, status: { [Op.in]: ['pending', 'sending'] } } }),
  ])
  return { deliveries: rows.map(deliveryView), failedCount, waitingCount }
})
