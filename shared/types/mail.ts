/** What a message is: one key per organisation, recipient, kind and period. */
export type MailKind = 'invitation' | 'password_reset' | 'weekly_status'

/** Where a message stands in the outbox. */
export type OutboxStatus = 'pending' | 'sending' | 'sent' | 'failed' | 'cancelled'

export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  invitation: 'Invitation',
  password_reset: 'Password reset',
  weekly_status: 'Weekly status',
}

export const OUTBOX_STATUS_LABELS: Record<OutboxStatus, string> = {
  pending: 'Waiting to send',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Failed',
  cancelled: 'Not sent: no longer wanted',
}

/** One line of the delivery log, as managers see it. */
export interface DeliveryView {
  id: number
  kind: MailKind
  recipientEmail: string
  recipientName: string | null
  subject: string
  periodKey: string
  status: OutboxStatus
  attempts: number
  lastError: string | null
  queuedAt: string
  nextAttemptAt: string | null
  sentAt: string | null
}

/** The delivery log: the newest messages first, and the count of those that failed for good. */
export interface DeliveryLogView {
  deliveries: DeliveryView[]
  failedCount: number
  waitingCount: number
}

/** A message the demo mailbox holds, as its page lists it. */
export interface DemoMailSummary {
  id: number
  from: string | null
  to: string
  subject: string | null
  receivedAt: string
}

/** A message the demo mailbox holds, opened. */
export interface DemoMailView extends DemoMailSummary {
  html: string | null
  text: string | null
  headers: { name: string, value: string }[]
}
