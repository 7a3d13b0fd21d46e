import { simpleParser } from 'mailparser'
import { idParamSchema } from '../../../shared/schemas/organisation'
import type { DemoMailView } from '../../../shared/types/mail'

/** One message of the demo mailbox, read with mailparser: its HTML and text parts and its headers. */
export default defineEventHandler(async (event): Promise<DemoMailView> => {
  requireDemoMode()
  const caller = await requireCaller(event, ['manager'])
  const { id } = await paramsWith(event, idParamSchema)
  // Another organisation's message is a 404, as if it were not there.
  const [mine] = await demoMailIdsFor(caller, { id })
  const row = mine === undefined ? null : await useModels().DemoMail.findByPk(id)
  if (!row) throw notFound('message')
  const parsed = await simpleParser(row.raw)
  return {
    id: row.id,
    from: row.envelopeFrom,
    to: row.envelopeTo,
    subject: row.subject,
    receivedAt: row.createdAt.toISOString(),
    html: parsed.html || null,
    text: parsed.text ?? null,
    headers: parsed.headerLines.map(h => ({ name: h.key, value: h.line.slice(h.line.indexOf(':') + 1).trim() })),
  }
})
