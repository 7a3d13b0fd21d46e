import { weeklyPreviewQuerySchema } from '../../../shared/schemas/weekly'
import type { WeeklyPreviewView } from '../../../shared/types/weekly'

/**
 * Exactly what a member gets this week (managers): once queued, the message in the outbox; before
 * that, the message as this week's run would render it now, with the same scoping and headers.
 */
export default defineEventHandler(async (event): Promise<WeeklyPreviewView> => {
  const caller = await requireCaller(event, ['manager'])
  const { userId } = await queryWith(event, weeklyPreviewQuerySchema)
  const organisation = await callerWeeklyOrganisation(caller)
  const { week } = weeklyWeekOf(organisation)
  const member = (await loadWeeklyRecipients(organisation, week)).find(m => m.userId === userId)
  if (!member) throw notFound('member')
  const base = { week, member: { userId: member.userId, name: member.name, email: member.email, role: member.role }, receives: member.receives, state: member.state }
  if (member.delivery) {
    const stored = await useModels().MailOutbox.findByPk(member.delivery.id)
    if (stored) return { ...base, source: 'outbox', subject: stored.subject, html: stored.html, text: stored.text, headers: stored.headers }
  }
  const message = await weeklyMessageFor(organisation, member, week)
  return { ...base, source: 'now', ...message }
})
