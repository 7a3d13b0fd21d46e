import type { MailOutbox } from '../database/models'
import type { DeliveryView } from '../../shared/types/mail'

/** An outbox row as the delivery log shows it (no message body). */
export function deliveryView(row: MailOutbox): DeliveryView {
  return {
    id: row.id,
    kind: row.kind,
    recipientEmail: row.recipientEmail,
    recipientName: row.recipientName,
    subject: row.subject,
    periodKey: row.periodKey,
    status: row.status,
    attempts: row.attempts,
    lastError: row.lastError,
    queuedAt: row.createdAt.toISOString(),
    nextAttemptAt: row.status === 'pending' ? row.nextAttemptAt.toISOString() : null,
    sentAt: row.sentAt?.toISOString() ?? null,
  }
}

/** A 404 for the demo mailbox outside demo mode: the page is not there at all. */
export function requireDemoMode() {
  if (!useRuntimeConfig().public.demoMode) throw notFound('page')
}
