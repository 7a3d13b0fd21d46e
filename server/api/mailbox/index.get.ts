import type { DemoMailSummary } from '../../../shared/types/mail'

/** The demo mailbox: the messages the demo's own SMTP server received for people of the manager's organisation, newest first. Managers, demo mode only. */
export default defineEventHandler(async (event): Promise<DemoMailSummary[]> => {
  requireDemoMode()
  const caller = await requireCaller(event, ['manager'])
  const rows = await useModels().DemoMail.findAll({
    where: { id: await demoMailIdsFor(caller) },
    attributes: ['id', 'envelopeFrom', 'envelopeTo', 'subject', 'createdAt'],
    order: [['id', 'DESC']],
    limit: 200,
  })
  return rows.map(r => ({ id: r.id, from: r.envelopeFrom, to: r.envelopeTo, subject: r.subject, receivedAt: r.createdAt.toISOString() }))
})
