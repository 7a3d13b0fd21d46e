import { idParamSchema } from '../../../../../shared/schemas/organisation'

/** Tries a failed message again from the start (its tries counted afresh). Managers only; 409 unless it failed. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const { id } = await paramsWith(event, idParamSchema)
  const { MailOutbox } = useModels()
  const row = await MailOutbox.findOne({ where: { id, organisationId: caller.organisationId } })
  if (!row) throw notFound('message')
  if (row.status !== 'failed') {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: row.status === 'sent' ? 'That message was sent already.' : 'That message is still waiting to be sent.' })
  }
  const [count] = await MailOutbox.update(
    { status: 'pending', attempts: 0, lastError: null, nextAttemptAt: new Date() },
    { where: { id, organisationId: caller.organisationId, status: 'failed' } },
  )
  if (count) await askToSend(id)
  await row.reload()
  return deliveryView(row)
})
